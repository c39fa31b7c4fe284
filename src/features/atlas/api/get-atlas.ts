import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { AtlasLanding } from '../../../../shared/schemas/synthesis';

export type { AtlasLanding };

export const getAtlas = () => api<AtlasLanding>('/api/atlas');
export const atlasQueryOptions = () => queryOptions({ queryKey: queryKeys.atlas.landing(), queryFn: getAtlas, staleTime: 60_000 });
export function useAtlas() {
  return useQuery(atlasQueryOptions());
}
