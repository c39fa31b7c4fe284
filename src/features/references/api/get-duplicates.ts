import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { DuplicateCandidate, DuplicatePage } from '../../../../shared/schemas/references';

export type { DuplicateCandidate };
export type DuplicateSide = DuplicateCandidate['a'];
export interface DuplicateQuery {
  status: 'open' | 'merged' | 'dismissed';
  page: number;
  pageSize: number;
  sort?: 'created_at' | 'year';
  order?: 'asc' | 'desc';
}

export const getDuplicates = (q: DuplicateQuery) => api<DuplicatePage>(`/api/duplicates${queryString({ ...q })}`);

export const duplicatesQueryOptions = (q: DuplicateQuery) => queryOptions({ queryKey: queryKeys.duplicates.list(q), queryFn: () => getDuplicates(q), placeholderData: keepPreviousData });

export function useDuplicates(q: DuplicateQuery) {
  return useQuery(duplicatesQueryOptions(q));
}
