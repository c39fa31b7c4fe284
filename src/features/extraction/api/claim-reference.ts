import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { Created } from '../../../../shared/schemas/extraction';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const claimReference = (referenceId: number) => api<Created>('/api/extractions', { method: 'POST', body: { referenceId } });

export function useClaimReference() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: claimReference, onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.extractions.all }), qc.invalidateQueries({ queryKey: queryKeys.assignments.all })]) });
}
