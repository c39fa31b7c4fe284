import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RecordVersionResult } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const reopenRecord = ({ id, reason }: { id: number; reason: string }) =>
  api<RecordVersionResult>(`/api/records/${id}/reopen`, { method: 'POST', body: { reason } });

export function useReopenRecord() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: reopenRecord, onSuccess: () => settledWorkChanged(qc) });
}
