import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { CandidatePage, CandidateQuery } from '../../../../shared/schemas/reconciliation';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Candidate } from '../../../../shared/schemas/reconciliation';

export type CandidatesQuery = CandidateQuery;

export const getCandidates = (q: CandidatesQuery) => api<CandidatePage>(`/api/assignments/candidates${queryString({ ...q })}`);

export const candidatesQueryOptions = (q: CandidatesQuery) =>
  queryOptions({ queryKey: queryKeys.assignments.candidates(q), queryFn: () => getCandidates(q), placeholderData: keepPreviousData });

export function useCandidates(q: CandidatesQuery) {
  return useQuery(candidatesQueryOptions(q));
}
