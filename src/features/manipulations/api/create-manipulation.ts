import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ManipulationResult } from '../../../../shared/schemas/registry';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const createManipulation = (body: { term: string; label: string; description?: string }) =>
  api<ManipulationResult>('/api/manipulations', { method: 'POST', body });

export function useCreateManipulation() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createManipulation, onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.manipulations.all }), registryChanged(qc)]) });
}
