import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReferenceEdit, ReferenceEditResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const editReference = ({ id, edit }: { id: number; edit: ReferenceEdit }) =>
  api<ReferenceEditResult>(`/api/references/${id}`, { method: 'PATCH', body: edit });

export function useEditReference() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: editReference,
    // Titles, years and authors show in syntheses, the atlas and search.
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.references.all }), qc.invalidateQueries({ queryKey: queryKeys.duplicates.all }), registryChanged(qc)]),
  });
}
