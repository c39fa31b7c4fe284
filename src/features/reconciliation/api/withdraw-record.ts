import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { WithdrawnRecord } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const withdrawRecord = ({ id, reason }: { id: number; reason: string }) =>
  api<WithdrawnRecord>(`/api/records/${id}/withdraw`, { method: 'POST', body: { reason } });

export function useWithdrawRecord() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: withdrawRecord, onSuccess: () => settledWorkChanged(qc) });
}
