import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ScreeningQueue } from '../../../../shared/schemas/references';
import type { ScreeningStage } from '../../../../shared/vocabulary/screening';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { ScreeningQueueItem as QueueItem } from '../../../../shared/schemas/references';


export type QueueQuery = { limit: number; stage: ScreeningStage; batch?: number };

export const getQueue = (q: QueueQuery) => api<ScreeningQueue>(`/api/screening/queue${queryString(q)}`);

export const queueQueryOptions = (q: QueueQuery) => queryOptions({ queryKey: queryKeys.screening.list(q), queryFn: () => getQueue(q) });

export function useQueue(q: QueueQuery) {
  return useQuery(queueQueryOptions(q));
}

/** How many records the reading list shows at once. */
export const QUEUE_LIMIT = 50;

/** The stage a screening address names (`?stage=full_text`), title and abstract otherwise. */
export const stageFromParam = (v: string | null): ScreeningStage => (v === 'full_text' ? 'full_text' : 'title_abstract');
