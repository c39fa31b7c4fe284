import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningUndoInput, ScreeningUndoResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const undoDecision = ({ refId, input }: { refId: number; input: ScreeningUndoInput }) =>
  api<ScreeningUndoResult>(`/api/references/${refId}/screening/undo`, { body: input });

export function useUndoDecision() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: undoDecision,
    // The reference returns to the queue; the search index carries its status too.
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
        qc.invalidateQueries({ queryKey: queryKeys.references.all }),
        qc.invalidateQueries({ queryKey: queryKeys.search.all }),
      ]),
  });
}
