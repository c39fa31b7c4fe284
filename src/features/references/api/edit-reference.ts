import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReferenceEdit } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { referencesKeys } from './keys';

export const editReference = ({ id, edit }: { id: number; edit: ReferenceEdit }) =>
  api<{ id: number; version: number; changed: string[] }>(`/api/references/${id}`, { method: 'PATCH', body: edit });

export function useEditReference() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: editReference, onSuccess: () => qc.invalidateQueries({ queryKey: referencesKeys.all }) });
}
