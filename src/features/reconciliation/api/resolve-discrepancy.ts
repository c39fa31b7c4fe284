import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ResolvedDiscrepancy } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const resolveDiscrepancy = ({ assignmentId, id, ...body }: { assignmentId: number; id: number; resolution: 'a' | 'b' | 'value'; value?: unknown; rationale: string }) =>
  api<ResolvedDiscrepancy>(`/api/reconciliation/${assignmentId}/discrepancies/${id}`, { method: 'PUT', body });

export function useResolveDiscrepancy(assignmentId: number) {
  const qc = useQueryClient();
  return useMutation({ mutationFn: resolveDiscrepancy, onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.reconciliation.detail(assignmentId) }) });
}
