import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Follow } from '../../../../shared/schemas/following';
import type { SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

/** What is followed: a synthesis request, or a snapshot (by its id). */
export type FollowTarget = { request: SynthesisRequest } | { snapshotId: string };

export const createFollow = (body: FollowTarget & { seShare: number; weightShare: number }) => api<Follow>('/api/follows', { body });

export function useCreateFollow() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createFollow, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.follows.all }) });
}
