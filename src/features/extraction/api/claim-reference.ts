import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { extractionKeys } from './keys';

export const claimReference = (referenceId: number) => api<{ id: number }>('/api/extractions', { method: 'POST', body: { referenceId } });

export function useClaimReference() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: claimReference, onSuccess: () => qc.invalidateQueries({ queryKey: extractionKeys.all }) });
}
