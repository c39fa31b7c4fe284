import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedAssignment } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const createAssignment = (body: { referenceId: number; coder1Id: number; coder2Id: number }) =>
  api<CreatedAssignment>('/api/assignments', { method: 'POST', body });

export function useCreateAssignment() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: createAssignment,
    onSuccess: (created) =>
      Promise.all([
        ...[queryKeys.assignments.all, queryKeys.extractions.all, queryKeys.reconciliation.all, queryKeys.agreement.all].map((queryKey) => qc.invalidateQueries({ queryKey })),
        // Two submitted claims that agree settle at once.
        ...(created.state === 'settled' ? [qc.invalidateQueries({ queryKey: queryKeys.records.all }), registryChanged(qc)] : []),
      ]),
  });
}
