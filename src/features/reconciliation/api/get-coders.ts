import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reconciliationKeys } from './keys';

export interface Coder {
  id: number;
  login: string;
  name: string | null;
}

export const getCoders = () => api<{ items: Coder[] }>('/api/assignments/coders');

export const codersQueryOptions = () => queryOptions({ queryKey: reconciliationKeys.coders(), queryFn: getCoders, staleTime: 60_000 });

export function useCoders() {
  return useQuery(codersQueryOptions());
}
