import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { MyExtractionPage, MyExtractionsQuery } from '../../../../shared/schemas/extraction';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { MyExtraction, MyExtractionsQuery } from '../../../../shared/schemas/extraction';

export const getMyExtractions = (q: MyExtractionsQuery) => api<MyExtractionPage>(`/api/extractions${queryString({ ...q })}`);

export const myExtractionsQueryOptions = (q: MyExtractionsQuery) =>
  queryOptions({ queryKey: queryKeys.extractions.list(q), queryFn: () => getMyExtractions(q), placeholderData: keepPreviousData });

export function useMyExtractions(q: MyExtractionsQuery) {
  return useQuery(myExtractionsQueryOptions(q));
}
