import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { ScreeningDecisionInput } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { screeningKeys } from './keys';

export const decide = ({ refId, input }: { refId: number; input: ScreeningDecisionInput }) =>
  api<{ id: number; refId: number; screeningStatus: string }>(`/api/references/${refId}/screening`, { body: input });

export function useDecide() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: decide,
    onSuccess: (_d, v) => {
      void qc.invalidateQueries({ queryKey: screeningKeys.all });
      void qc.invalidateQueries({ queryKey: ['references'] });
      void qc.invalidateQueries({ queryKey: ['references', 'detail', v.refId] });
    },
  });
}
