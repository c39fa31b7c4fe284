import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SynthesisOutput } from '../../../../shared/synthesis/types';
import type { PrismaCounts } from '../../../../shared/synthesis/methods';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type Snapshot = SynthesisOutput & {
  id: string;
  title: string;
  url: string;
  createdAt: string;
  createdBy: { login: string; name: string | null } | null;
  registryVersion: number;
  software: string;
  methods: string;
  prisma: PrismaCounts | null;
  effects: Array<Record<string, unknown> & { id: number }>;
  references: Array<{ id: number; title: string; year: number | null; doi: string | null; firstAuthor: string | null }>;
};

export const getSnapshot = (id: string) => api<Snapshot>(`/api/snapshots/${encodeURIComponent(id)}`);

// Snapshots never change: cache forever.
export const snapshotQueryOptions = (id: string) => queryOptions({ queryKey: queryKeys.snapshots.detail(id), queryFn: () => getSnapshot(id), staleTime: Infinity, retry: false });

export function useSnapshot(id: string) {
  return useQuery(snapshotQueryOptions(id));
}
