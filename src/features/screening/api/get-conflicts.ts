import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ScreeningConflicts } from '../../../../shared/schemas/screening';
import type { ScreeningStage } from '../../../../shared/vocabulary/screening';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getConflicts = (stage: ScreeningStage) => api<ScreeningConflicts>(`/api/screening/conflicts${queryString({ stage, limit: 50 })}`);
export const conflictsQueryOptions = (stage: ScreeningStage) => queryOptions({ queryKey: [...queryKeys.screening.all, 'conflicts', stage] as const, queryFn: () => getConflicts(stage) });

export function useConflicts(stage: ScreeningStage) {
  return useQuery(conflictsQueryOptions(stage));
}
