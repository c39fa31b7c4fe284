import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningDecisionInput, ScreeningResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const decide = ({ refId, input }: { refId: number; input: ScreeningDecisionInput }) =>
  api<ScreeningResult>(`/api/references/${refId}/screening`, { body: input });

export function useDecide() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decide,
    // The search index carries the screening status too.
    onSuccess: () =>
      Promise.all([
        qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
        qc.invalidateQueries({ queryKey: queryKeys.references.all }),
        qc.invalidateQueries({ queryKey: queryKeys.search.all }),
      ]),
  });
}
