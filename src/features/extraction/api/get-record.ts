import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { ExtractionDetail } from './types';

export const getRecord = (id: number) => api<ExtractionDetail>(`/api/records/${id}`);

export const recordQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.records.detail(id), queryFn: () => getRecord(id), retry: false });

export function useRecord(id: number) {
  return useQuery(recordQueryOptions(id));
}
