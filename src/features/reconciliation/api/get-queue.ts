import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ReconciliationQuery, ReconciliationQueue } from '../../../../shared/schemas/reconciliation';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { DisputedPair as QueueItem, ReopenedRecord as ReopenedItem } from '../../../../shared/schemas/reconciliation';

export type QueueQuery = ReconciliationQuery;

export const getQueue = (q: QueueQuery) => api<ReconciliationQueue>(`/api/reconciliation${queryString({ ...q })}`);

export const queueQueryOptions = (q: QueueQuery) => queryOptions({ queryKey: queryKeys.reconciliation.list(q), queryFn: () => getQueue(q), placeholderData: keepPreviousData });

export function useQueue(q: QueueQuery) {
  return useQuery(queueQueryOptions(q));
}
