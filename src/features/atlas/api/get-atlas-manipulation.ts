import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { Counts, PooledCell } from './types';

export interface AtlasManipulation {
  manipulation: { term: string; label: string; description: string; retired: boolean };
  totals: Counts;
  cells: PooledCell[];
}

export const getAtlasManipulation = (term: string) => api<AtlasManipulation>(`/api/atlas/manipulations/${encodeURIComponent(term)}`);
export const atlasManipulationQueryOptions = (term: string) =>
  queryOptions({ queryKey: queryKeys.atlas.manipulation(term), queryFn: () => getAtlasManipulation(term), staleTime: 60_000, retry: false });
export function useAtlasManipulation(term: string) {
  return useQuery(atlasManipulationQueryOptions(term));
}
