import { queryOptions, useQuery } from '@tanstack/react-query';
import type { TrialSetList } from '../../../../shared/schemas/trials';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getTrialSets = (extractionId: number) => api<TrialSetList>(`/api/extractions/${extractionId}/trial-sets`);

export const trialSetsQueryOptions = (extractionId: number) =>
  queryOptions({ queryKey: queryKeys.trials.ofSheet(extractionId), queryFn: () => getTrialSets(extractionId), retry: false });

export function useTrialSets(extractionId: number) {
  return useQuery(trialSetsQueryOptions(extractionId));
}
