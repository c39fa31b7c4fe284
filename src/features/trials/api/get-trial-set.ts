import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrialSetDetail } from '../../../../shared/schemas/trials';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getTrialSet = (setId: number) => api<TrialSetDetail>(`/api/trial-sets/${setId}`);

/** While its fits are queued or running the set is asked again every second (progress), then no more. */
export const trialSetQueryOptions = (setId: number) =>
  queryOptions({
    queryKey: queryKeys.trials.detail(setId),
    queryFn: () => getTrialSet(setId),
    retry: false,
    refetchInterval: (q) => (q.state.data && ['queued', 'running'].includes(q.state.data.set.fit.state) ? 1000 : false),
  });

export function useTrialSet(setId: number) {
  return useQuery(trialSetQueryOptions(setId));
}
