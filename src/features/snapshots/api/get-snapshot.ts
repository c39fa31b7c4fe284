import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SnapshotView } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type Snapshot = SnapshotView;

export const getSnapshot = (id: string) => api<Snapshot>(`/api/snapshots/${encodeURIComponent(id)}`);

// Snapshots never change: cache forever.
export const snapshotQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.snapshots.detail(id), queryFn: () => getSnapshot(id), staleTime: Infinity, retry: false });

export function useSnapshot(id: string) {
  return useQuery(snapshotQueryOptions(id));
}
