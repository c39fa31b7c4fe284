import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningDecisionInput, ScreeningResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { registryChanged } from '../../../lib/query/registry-changed';

export const decide = ({ refId, input }: { refId: number; input: ScreeningDecisionInput }) =>
  api<ScreeningResult>(`/api/references/${refId}/screening`, { body: input });

export function useDecide() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decide,
    // The search index carries the screening status too; a curator's exclusion may withdraw settled records.
    onSuccess: (result) =>
      Promise.all([
        qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
        qc.invalidateQueries({ queryKey: queryKeys.references.all }),
        qc.invalidateQueries({ queryKey: queryKeys.search.all }),
        result.withdrawnRecords.length ? registryChanged(qc) : undefined,
      ]),
    // A stale decision (409) is refused: show the reference as it is now.
    onError: () => qc.invalidateQueries({ queryKey: queryKeys.screening.all }).then(() => qc.invalidateQueries({ queryKey: queryKeys.references.all })),
  });
}
