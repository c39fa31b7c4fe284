import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningResult } from '../../../../shared/schemas/references';
import type { ScreeningSettleInput } from '../../../../shared/schemas/screening';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { screeningChanged } from './screening-changed';

export const settle = ({ refId, input }: { refId: number; input: ScreeningSettleInput }) => api<ScreeningResult>(`/api/screening/conflicts/${refId}/settle`, { body: input });

export function useSettle() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: settle,
    onSuccess: () => screeningChanged(qc, false),
    // A stale settlement (409) is refused: show the queue as it is now.
    onError: () => qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
  });
}
