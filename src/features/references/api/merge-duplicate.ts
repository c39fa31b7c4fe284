import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { referencesKeys } from './keys';

export const mergeDuplicate = ({ candidateId, keep }: { candidateId: number; keep: number }) =>
  api<{ kept: number; merged: number; moved: Record<string, number> }>(`/api/duplicates/${candidateId}/merge`, { body: { keep } });

export function useMergeDuplicate() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: mergeDuplicate, onSuccess: () => qc.invalidateQueries({ queryKey: referencesKeys.all }) });
}
