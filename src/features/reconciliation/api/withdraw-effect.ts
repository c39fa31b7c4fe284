import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { WithdrawnEffect } from '../../../../shared/schemas/registry';
import { api } from '../../../lib/api-client';
import { settledWorkChanged } from './settled-work-changed';

export const withdrawEffect = ({ id, reason }: { id: number; reason: string }) =>
  api<WithdrawnEffect>(`/api/effects/${id}/withdraw`, { method: 'POST', body: { reason } });

export function useWithdrawEffect() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: withdrawEffect, onSuccess: () => settledWorkChanged(qc) });
}
