import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { referencesKeys } from './keys';

export const dismissDuplicate = (candidateId: number) => api<{ id: number; status: string }>(`/api/duplicates/${candidateId}/dismiss`, { body: {} });

export function useDismissDuplicate() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: dismissDuplicate, onSuccess: () => qc.invalidateQueries({ queryKey: referencesKeys.all }) });
}
