import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningDecisionInput, ScreeningResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { screeningChanged } from './screening-changed';

export const decide = ({ refId, input }: { refId: number; input: ScreeningDecisionInput }) =>
  api<ScreeningResult>(`/api/references/${refId}/screening`, { body: input });

export function useDecide() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decide,
    onSuccess: (result) => screeningChanged(qc, result.withdrawnRecords.length > 0),
    // A stale decision (409) is refused: show the reference as it is now.
    onError: () => qc.invalidateQueries({ queryKey: queryKeys.screening.all }).then(() => qc.invalidateQueries({ queryKey: queryKeys.references.all })),
  });
}
