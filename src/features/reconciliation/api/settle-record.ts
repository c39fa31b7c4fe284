import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RecordVersionResult } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const settleRecord = ({ id, rationale, version }: { id: number; rationale: string; version?: number }) =>
  api<RecordVersionResult>(`/api/records/${id}/settle`, { method: 'POST', body: { rationale, version } });

export function useSettleRecord() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: settleRecord, onSuccess: () => settledWorkChanged(qc) });
}
