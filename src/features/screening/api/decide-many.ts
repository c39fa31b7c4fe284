import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningBatchDecisionInput, ScreeningBatchResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import { screeningChanged } from './screening-changed';

export const decideMany = (input: ScreeningBatchDecisionInput) => api<ScreeningBatchResult>('/api/screening/decisions', { body: input });

export function useDecideMany() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decideMany,
    onSuccess: (answer) => screeningChanged(qc, answer.results.some((r) => r.withdrawnRecords.length > 0)),
    // A stale reference refuses the batch (409): show the queue as it is now.
    onError: () => qc.invalidateQueries({ queryKey: queryKeys.screening.all }),
  });
}
