import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const settleRecord = ({ id, rationale, version }: { id: number; rationale: string; version?: number }) =>
  api<{ recordId: number; recordVersion: number; registryVersion: number }>(`/api/records/${id}/settle`, { method: 'POST', body: { rationale, version } });

export function useSettleRecord() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: settleRecord, onSuccess: () => settledWorkChanged(qc) });
}
