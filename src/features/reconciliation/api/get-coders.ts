import { queryOptions, useQuery } from '@tanstack/react-query';
import type { CoderList } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Coder } from '../../../../shared/schemas/reconciliation';

export const getCoders = () => api<CoderList>('/api/assignments/coders');

export const codersQueryOptions = () => queryOptions({ queryKey: queryKeys.assignments.coders(), queryFn: getCoders, staleTime: 60_000 });

export function useCoders() {
  return useQuery(codersQueryOptions());
}
