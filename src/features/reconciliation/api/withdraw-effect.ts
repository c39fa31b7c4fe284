import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { reconciliationKeys } from './keys';

export const withdrawEffect = ({ id, reason }: { id: number; reason: string }) =>
  api<{ id: number; withdrawn: boolean; registryVersion: number }>(`/api/effects/${id}/withdraw`, { method: 'POST', body: { reason } });

export function useWithdrawEffect() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: withdrawEffect, onSuccess: () => qc.invalidateQueries({ queryKey: reconciliationKeys.all }) });
}
