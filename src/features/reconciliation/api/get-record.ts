import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ExtractionDetail } from '../../extraction/api/types';
import { reconciliationKeys } from './keys';

export const getRecord = (id: number) => api<ExtractionDetail>(`/api/records/${id}`);

export const recordQueryOptions = (id: number) => queryOptions({ queryKey: reconciliationKeys.record(id), queryFn: () => getRecord(id), retry: false });

export function useRecord(id: number) {
  return useQuery(recordQueryOptions(id));
}
