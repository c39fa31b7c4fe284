import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface ClaimableQuery {
  q?: string;
  page: number;
  pageSize: number;
  sort: 'reference' | 'year';
  order: 'asc' | 'desc';
}
export interface Claimable {
  id: number;
  title: string;
  referenceLabel: string;
  year: number | null;
  doi: string | null;
}

export const getClaimable = (q: ClaimableQuery) => api<{ items: Claimable[]; total: number }>(`/api/extractions/claimable${queryString({ ...q })}`);

export const claimableQueryOptions = (q: ClaimableQuery) =>
  queryOptions({ queryKey: queryKeys.extractions.claimable(q), queryFn: () => getClaimable(q), placeholderData: keepPreviousData });

export function useClaimable(q: ClaimableQuery) {
  return useQuery(claimableQueryOptions(q));
}
