import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SearchQuery, SearchResult } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const searchReferences = (q: Partial<SearchQuery>) => api<SearchResult>(`/api/search${queryString(q)}`);

export const searchQueryOptions = (q: Partial<SearchQuery>) =>
  queryOptions({ queryKey: queryKeys.search.list(q), queryFn: () => searchReferences(q), placeholderData: keepPreviousData, staleTime: 5_000 });

export function useSearch(q: Partial<SearchQuery>) {
  return useQuery(searchQueryOptions(q));
}
