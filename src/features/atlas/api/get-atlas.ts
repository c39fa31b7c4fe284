import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { Counts } from './types';

export interface AtlasLanding {
  totals: Counts;
  manipulations: Array<Counts & { term: string; label: string; description: string; outcomes: string[] }>;
  outcomes: Array<Counts & { kind: string; label: string; typicalReport: string; metrics: string[] }>;
}

export const getAtlas = () => api<AtlasLanding>('/api/atlas');
export const atlasQueryOptions = () => queryOptions({ queryKey: queryKeys.atlas.landing(), queryFn: getAtlas, staleTime: 60_000 });
export function useAtlas() {
  return useQuery(atlasQueryOptions());
}
