import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface Coder {
  id: number;
  login: string;
  name: string | null;
}

export const getCoders = () => api<{ items: Coder[] }>('/api/assignments/coders');

export const codersQueryOptions = () => queryOptions({ queryKey: queryKeys.assignments.coders(), queryFn: getCoders, staleTime: 60_000 });

export function useCoders() {
  return useQuery(codersQueryOptions());
}
