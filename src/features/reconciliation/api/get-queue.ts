import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface QueueQuery {
  page: number;
  pageSize: number;
  sort: 'updated' | 'reference' | 'open';
  order: 'asc' | 'desc';
}
export interface QueueItem {
  assignmentId: number;
  referenceId: number;
  referenceLabel: string;
  title: string;
  coder1: string;
  coder2: string;
  openDiscrepancies: number;
  discrepancies: number;
  updatedAt: string;
}
export interface ReopenedItem {
  recordId: number;
  referenceId: number;
  referenceLabel: string;
  title: string;
  recordVersion: number;
  reason: string;
  updatedAt: string;
}

export const getQueue = (q: QueueQuery) => api<{ items: QueueItem[]; total: number; reopened: ReopenedItem[] }>(`/api/reconciliation${queryString({ ...q })}`);

export const queueQueryOptions = (q: QueueQuery) => queryOptions({ queryKey: queryKeys.reconciliation.list(q), queryFn: () => getQueue(q), placeholderData: keepPreviousData });

export function useQueue(q: QueueQuery) {
  return useQuery(queueQueryOptions(q));
}
