import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SettledRecord } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const settlePair = ({ assignmentId, rationale }: { assignmentId: number; rationale: string }) =>
  api<SettledRecord>(`/api/reconciliation/${assignmentId}/settle`, { method: 'POST', body: { rationale } });

export function useSettlePair() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: settlePair, onSuccess: () => settledWorkChanged(qc) });
}
