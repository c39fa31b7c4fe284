import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reconciliationKeys } from './keys';

export const reopenRecord = ({ id, reason }: { id: number; reason: string }) =>
  api<{ recordId: number; recordVersion: number; registryVersion: number }>(`/api/records/${id}/reopen`, { method: 'POST', body: { reason } });

export function useReopenRecord() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: reopenRecord, onSuccess: () => qc.invalidateQueries({ queryKey: reconciliationKeys.all }) });
}
