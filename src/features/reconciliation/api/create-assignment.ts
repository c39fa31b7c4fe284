import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreatedAssignment } from '../../../../shared/schemas/reconciliation';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const createAssignment = (body: { referenceId: number; coder1Id: number; coder2Id: number }) =>
  api<CreatedAssignment>('/api/assignments', { method: 'POST', body });

export function useCreateAssignment() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createAssignment, onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: queryKeys.assignments.all }), qc.invalidateQueries({ queryKey: queryKeys.extractions.all })]) });
}
