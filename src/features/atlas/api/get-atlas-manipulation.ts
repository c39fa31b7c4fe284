import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { AtlasManipulation } from '../../../../shared/schemas/synthesis';

export type { AtlasManipulation };

export const getAtlasManipulation = (term: string) => api<AtlasManipulation>(`/api/atlas/manipulations/${encodeURIComponent(term)}`);
export const atlasManipulationQueryOptions = (term: string) =>
  queryOptions({ queryKey: queryKeys.atlas.manipulation(term), queryFn: () => getAtlasManipulation(term), staleTime: 60_000, retry: false });
export function useAtlasManipulation(term: string) {
  return useQuery(atlasManipulationQueryOptions(term));
}
