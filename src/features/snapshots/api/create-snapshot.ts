import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedSnapshot, SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { CreatedSnapshot };

export const createSnapshot = (body: SynthesisRequest & { title?: string }) => api<CreatedSnapshot>('/api/snapshots', { body });

export function useCreateSnapshot() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createSnapshot, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.snapshots.lists() }) });
}
