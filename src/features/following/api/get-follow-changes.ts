import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FollowChanges } from '../../../../shared/schemas/following';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getFollowChanges = (id: number, since: number | undefined) =>
  api<FollowChanges>(`/api/follows/${id}/changes${since === undefined ? '' : `?since=${since}`}`);

export const followChangesQueryOptions = (id: number, since: number | undefined) =>
  queryOptions({ queryKey: queryKeys.follows.changes(id, since), queryFn: () => getFollowChanges(id, since), retry: false });

export function useFollowChanges(id: number, since: number | undefined) {
  return useQuery(followChangesQueryOptions(id, since));
}
