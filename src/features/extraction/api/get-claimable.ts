import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ClaimablePage, ClaimableQuery } from '../../../../shared/schemas/extraction';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Claimable, ClaimableQuery } from '../../../../shared/schemas/extraction';

export const getClaimable = (q: ClaimableQuery) => api<ClaimablePage>(`/api/extractions/claimable${queryString({ ...q })}`);

export const claimableQueryOptions = (q: ClaimableQuery) =>
  queryOptions({ queryKey: queryKeys.extractions.claimable(q), queryFn: () => getClaimable(q), placeholderData: keepPreviousData });

export function useClaimable(q: ClaimableQuery) {
  return useQuery(claimableQueryOptions(q));
}
