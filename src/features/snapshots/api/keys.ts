export interface SnapshotListQuery {
  page: number;
  pageSize: number;
  sort: 'created_at' | 'k' | 'estimate' | 'title';
  order: 'asc' | 'desc';
  mine?: 'true';
}

export const snapshotsKeys = {
  all: ['snapshots'] as const,
  lists: () => [...snapshotsKeys.all, 'list'] as const,
  list: (q: SnapshotListQuery) => [...snapshotsKeys.lists(), q] as const,
  details: () => [...snapshotsKeys.all, 'detail'] as const,
  detail: (id: string) => [...snapshotsKeys.details(), id] as const,
};
