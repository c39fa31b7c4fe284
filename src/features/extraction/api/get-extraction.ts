import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { extractionKeys } from './keys';
import type { ExtractionDetail } from './types';

export const getExtraction = (id: number) => api<ExtractionDetail>(`/api/extractions/${id}`);

export const extractionQueryOptions = (id: number) =>
  queryOptions({ queryKey: extractionKeys.detail(id), queryFn: () => getExtraction(id), staleTime: Infinity, retry: false });

export function useExtraction(id: number) {
  return useQuery(extractionQueryOptions(id));
}
