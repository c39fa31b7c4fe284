import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface MyExtractionsQuery {
  state?: string;
  page: number;
  pageSize: number;
  sort: 'updated' | 'reference' | 'state';
  order: 'asc' | 'desc';
}
export interface MyExtraction {
  id: number;
  state: string;
  version: number;
  updatedAt: string;
  assignmentId: number | null;
  referenceId: number;
  referenceLabel: string;
  title: string;
  effects: number;
}

export const getMyExtractions = (q: MyExtractionsQuery) => api<{ items: MyExtraction[]; total: number }>(`/api/extractions${queryString({ ...q })}`);

export const myExtractionsQueryOptions = (q: MyExtractionsQuery) =>
  queryOptions({ queryKey: queryKeys.extractions.list(q), queryFn: () => getMyExtractions(q), placeholderData: keepPreviousData });

export function useMyExtractions(q: MyExtractionsQuery) {
  return useQuery(myExtractionsQueryOptions(q));
}
