import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ScreeningQueue } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { ScreeningQueueItem as QueueItem } from '../../../../shared/schemas/references';

export const getQueue = (q: { limit: number; batch?: number }) => api<ScreeningQueue>(`/api/screening/queue${queryString(q)}`);

export const queueQueryOptions = (q: { limit: number; batch?: number }) => queryOptions({ queryKey: queryKeys.screening.list(q), queryFn: () => getQueue(q) });

export function useQueue(q: { limit: number; batch?: number }) {
  return useQuery(queueQueryOptions(q));
}

/** How many records the reading list shows at once. */
export const QUEUE_LIMIT = 50;
