import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface RecordVersion {
  id: number;
  state: string;
  recordVersion: number;
  current: boolean;
  supersededBy: number | null;
  reopenReason: string | null;
  settledAt: string | null;
  createdAt: string;
  updatedBy: string | null;
}
export interface SettlementRow {
  id: number;
  recordId: number;
  kind: string;
  by: string | null;
  rationale: string;
  at: string;
}

export const getRecords = (referenceId: number) => api<{ records: RecordVersion[]; settlements: SettlementRow[] }>(`/api/records${queryString({ referenceId })}`);

export const recordsQueryOptions = (referenceId: number) => queryOptions({ queryKey: queryKeys.records.history(referenceId), queryFn: () => getRecords(referenceId) });

export function useRecords(referenceId: number | undefined) {
  return useQuery({ ...recordsQueryOptions(referenceId ?? 0), enabled: !!referenceId });
}
