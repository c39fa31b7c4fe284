import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface CreatedSnapshot {
  id: string;
  url: string;
  apiUrl: string;
  registryVersion: number;
}

export const createSnapshot = (body: SynthesisRequest & { title?: string }) => api<CreatedSnapshot>('/api/snapshots', { body });

export function useCreateSnapshot() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createSnapshot, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.snapshots.lists() }) });
}
