import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { DismissResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const dismissDuplicate = (candidateId: number) => api<DismissResult>(`/api/duplicates/${candidateId}/dismiss`, { body: {} });

export function useDismissDuplicate() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: dismissDuplicate,
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.duplicates.all }), qc.invalidateQueries({ queryKey: queryKeys.references.details() })]),
  });
}
