import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';
import type { ManipulationResult } from '../../../../shared/schemas/registry';

export const updateManipulation = ({ term, ...body }: { term: string; version: number; label?: string; description?: string; retired?: boolean }) =>
  api<ManipulationResult>(`/api/manipulations/${term}`, { method: 'PATCH', body });

export function useUpdateManipulation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: updateManipulation,
    onSuccess: () => registryChanged(qc),
    // A refused edit (someone else changed the term first) still needs the current version.
    onSettled: () => qc.invalidateQueries({ queryKey: queryKeys.manipulations.all }),
  });
}
