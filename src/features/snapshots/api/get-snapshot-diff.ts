import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SnapshotDiff } from '../../../../shared/schemas/following';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getSnapshotDiff = (id: string) => api<SnapshotDiff>(`/api/snapshots/${encodeURIComponent(id)}/diff`);

/** How today's registry differs from the snapshot (asked again whenever the registry changes). */
export const snapshotDiffQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.snapshots.diff(id), queryFn: () => getSnapshotDiff(id), retry: false });

export function useSnapshotDiff(id: string) {
  return useQuery(snapshotDiffQueryOptions(id));
}
