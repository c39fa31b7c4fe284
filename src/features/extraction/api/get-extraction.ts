import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { ExtractionDetail } from './types';

export const getExtraction = (id: number) => api<ExtractionDetail>(`/api/extractions/${id}`);

export const extractionQueryOptions = (id: number) =>
  queryOptions({ queryKey: queryKeys.extractions.detail(id), queryFn: () => getExtraction(id), staleTime: Infinity, retry: false });

export function useExtraction(id: number) {
  return useQuery(extractionQueryOptions(id));
}
