import { queryOptions, useQuery } from '@tanstack/react-query';
import type { SynthesisFacets } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Facet, SynthesisFacets } from '../../../../shared/schemas/synthesis';

export const getFacets = () => api<SynthesisFacets>('/api/syntheses/facets');

export const facetsQueryOptions = () => queryOptions({ queryKey: queryKeys.synthesis.facets(), queryFn: getFacets, staleTime: 60_000 });

export function useFacets() {
  return useQuery(facetsQueryOptions());
}
