import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const dismissDuplicate = (candidateId: number) => api<{ id: number; status: string }>(`/api/duplicates/${candidateId}/dismiss`, { body: {} });

export function useDismissDuplicate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: dismissDuplicate,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.duplicates.all }), qc.invalidateQueries({ queryKey: queryKeys.references.details() })]),
  });
}
