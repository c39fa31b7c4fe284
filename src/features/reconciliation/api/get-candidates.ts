import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface CandidatesQuery {
  q?: string;
  status: 'unassigned' | 'any';
  page: number;
  pageSize: number;
  sort: 'reference' | 'year' | 'id';
  order: 'asc' | 'desc';
}
export interface Candidate {
  id: number;
  title: string;
  referenceLabel: string;
  year: number | null;
  doi: string | null;
  assignmentState: string | null;
  settled: boolean;
}

export const getCandidates = (q: CandidatesQuery) => api<{ items: Candidate[]; total: number }>(`/api/assignments/candidates${queryString({ ...q })}`);

export const candidatesQueryOptions = (q: CandidatesQuery) =>
  queryOptions({ queryKey: queryKeys.assignments.candidates(q), queryFn: () => getCandidates(q), placeholderData: keepPreviousData });

export function useCandidates(q: CandidatesQuery) {
  return useQuery(candidatesQueryOptions(q));
}
