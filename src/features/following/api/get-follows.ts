import { queryOptions, useQuery } from '@tanstack/react-query';
import type { FollowList } from '../../../../shared/schemas/following';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getFollows = () => api<FollowList>('/api/follows');

export const followsQueryOptions = () => queryOptions({ queryKey: queryKeys.follows.lists(), queryFn: getFollows });

export function useFollows() {
  return useQuery(followsQueryOptions());
}
