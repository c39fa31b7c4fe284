import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { Counts, PooledCell } from './types';

export interface AtlasOutcome {
  outcome: { kind: string; label: string; typicalReport: string; metrics: string[]; metricLabels: string[] };
  totals: Counts;
  cells: PooledCell[];
}

export const getAtlasOutcome = (kind: string) => api<AtlasOutcome>(`/api/atlas/outcomes/${encodeURIComponent(kind)}`);
export const atlasOutcomeQueryOptions = (kind: string) =>
  queryOptions({ queryKey: queryKeys.atlas.outcome(kind), queryFn: () => getAtlasOutcome(kind), staleTime: 60_000, retry: false });
export function useAtlasOutcome(kind: string) {
  return useQuery(atlasOutcomeQueryOptions(kind));
}
