import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ReconcilePairInput, ReconciledPair } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const reconcilePair = ({ assignmentId, ...body }: ReconcilePairInput & { assignmentId: number }) =>
  api<ReconciledPair>(`/api/reconciliation/${assignmentId}/reconcile`, { method: 'POST', body });

/** Every decision and the settled record in one request; the settled data changed. */
export function useReconcilePair() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: reconcilePair, onSuccess: () => settledWorkChanged(qc) });
}
