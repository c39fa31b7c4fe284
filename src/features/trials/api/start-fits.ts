import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { fitStartedSchema } from '../../../../shared/schemas/trials';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const startFits = ({ setId, resamples }: { setId: number; resamples: number }) =>
  api<z.infer<typeof fitStartedSchema>>(`/api/trial-sets/${setId}/fits`, { body: { resamples } });

export function useStartFits() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: startFits,
    onSuccess: () => qc.invalidateQueries({ queryKey: queryKeys.trials.all }),
  });
}
