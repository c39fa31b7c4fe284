import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { Page, ReferenceSummary } from './types';

export type DuplicateSide = ReferenceSummary & { richness: number; mergedInto: number | null; fields: number };
export interface DuplicateCandidate {
  id: number;
  reason: string;
  status: 'open' | 'merged' | 'dismissed';
  createdAt: string;
  decidedAt: string | null;
  decidedBy: { id: number; login: string } | null;
  keptRef: number | null;
  a: DuplicateSide;
  b: DuplicateSide;
}
export interface DuplicateQuery {
  status: 'open' | 'merged' | 'dismissed';
  page: number;
  pageSize: number;
  sort?: 'created_at' | 'year';
  order?: 'asc' | 'desc';
}

export const getDuplicates = (q: DuplicateQuery) => api<Page<DuplicateCandidate>>(`/api/duplicates${queryString({ ...q })}`);

export const duplicatesQueryOptions = (q: DuplicateQuery) => queryOptions({ queryKey: queryKeys.duplicates.list(q), queryFn: () => getDuplicates(q), placeholderData: keepPreviousData });

export function useDuplicates(q: DuplicateQuery) {
  return useQuery(duplicatesQueryOptions(q));
}
