import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface QueueItem {
  id: number;
  title: string;
  year: number | null;
  authors: string[];
  container: string | null;
  doi: string | null;
  abstract: string | null;
  version: number;
}

export const getQueue = (q: { limit: number; batch?: number }) => api<{ items: QueueItem[]; remaining: number }>(`/api/screening/queue${queryString(q)}`);

export const queueQueryOptions = (q: { limit: number; batch?: number }) => queryOptions({ queryKey: queryKeys.screening.list(q), queryFn: () => getQueue(q) });

export function useQueue(q: { limit: number; batch?: number }) {
  return useQuery(queueQueryOptions(q));
}
