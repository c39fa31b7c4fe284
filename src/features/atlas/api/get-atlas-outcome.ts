import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { AtlasOutcome } from '../../../../shared/schemas/synthesis';

export type { AtlasOutcome };

export const getAtlasOutcome = (kind: string) => api<AtlasOutcome>(`/api/atlas/outcomes/${encodeURIComponent(kind)}`);
export const atlasOutcomeQueryOptions = (kind: string) =>
  queryOptions({ queryKey: queryKeys.atlas.outcome(kind), queryFn: () => getAtlasOutcome(kind), staleTime: 60_000, retry: false });
export function useAtlasOutcome(kind: string) {
  return useQuery(atlasOutcomeQueryOptions(kind));
}
