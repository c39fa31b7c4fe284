import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SubmitResult } from '../../../../shared/schemas/extraction';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const submitExtraction = ({ id, version }: { id: number; version: number }) =>
  api<SubmitResult>(`/api/extractions/${id}/submit`, { method: 'POST', body: { version } });

export function useSubmitExtraction() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: submitExtraction,
    onSuccess: (result) =>
      Promise.all([
        ...[queryKeys.extractions.all, queryKeys.assignments.all, queryKeys.reconciliation.all, queryKeys.agreement.all].map((queryKey) => qc.invalidateQueries({ queryKey })),
        // Two codings that agree settle at once.
        ...(result.state === 'settled' ? [qc.invalidateQueries({ queryKey: queryKeys.records.all }), registryChanged(qc)] : []),
      ]),
  });
}
