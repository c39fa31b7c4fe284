import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { SnapshotPage } from '../../../../shared/schemas/synthesis';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { SnapshotSummary } from '../../../../shared/schemas/synthesis';

export interface SnapshotListQuery {
  page: number;
  pageSize: number;
  sort: 'created_at' | 'k' | 'estimate' | 'title';
  order: 'asc' | 'desc';
  mine?: 'true';
}

export const listSnapshots = (q: SnapshotListQuery) =>
  api<SnapshotPage>(`/api/snapshots${queryString({ ...q })}`);

export const snapshotsQueryOptions = (q: SnapshotListQuery) =>
  queryOptions({ queryKey: queryKeys.snapshots.list(q), queryFn: () => listSnapshots(q), placeholderData: keepPreviousData });

export function useSnapshots(q: SnapshotListQuery) {
  return useQuery(snapshotsQueryOptions(q));
}
