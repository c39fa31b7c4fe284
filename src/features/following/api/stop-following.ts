import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const stopFollowing = (id: number) => api<void>(`/api/follows/${id}`, { method: 'DELETE' });

export function useStopFollowing() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: stopFollowing, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.follows.lists() }) });
}
