import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface SnapshotListQuery {
  page: number;
  pageSize: number;
  sort: 'created_at' | 'k' | 'estimate' | 'title';
  order: 'asc' | 'desc';
  mine?: 'true';
}

export interface SnapshotSummary {
  id: string;
  title: string;
  createdAt: string;
  createdBy: string | null;
  metric: string;
  k: number;
  estimate: number;
  registryVersion: number;
}

export const listSnapshots = (q: SnapshotListQuery) =>
  api<{ items: SnapshotSummary[]; total: number; page: number; pageSize: number }>(`/api/snapshots${queryString({ ...q })}`);

export const snapshotsQueryOptions = (q: SnapshotListQuery) =>
  queryOptions({ queryKey: queryKeys.snapshots.list(q), queryFn: () => listSnapshots(q), placeholderData: keepPreviousData });

export function useSnapshots(q: SnapshotListQuery) {
  return useQuery(snapshotsQueryOptions(q));
}
