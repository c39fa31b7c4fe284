import { queryOptions, useQuery } from '@tanstack/react-query';
import type { RecordHistory } from '../../../../shared/schemas/reconciliation';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type RecordVersion = RecordHistory['records'][number];
export type SettlementRow = RecordHistory['settlements'][number];

export const getRecords = (referenceId: number) => api<RecordHistory>(`/api/records${queryString({ referenceId })}`);

export const recordsQueryOptions = (referenceId: number) => queryOptions({ queryKey: queryKeys.records.history(referenceId), queryFn: () => getRecords(referenceId) });

export function useRecords(referenceId: number | undefined) {
  return useQuery({ ...recordsQueryOptions(referenceId ?? 0), enabled: !!referenceId });
}
