import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface Facet {
  value: string;
  count: number;
  label?: string;
}

export interface SynthesisFacets {
  effects: number;
  manipulations: Facet[];
  outcomes: Facet[];
  metrics: Facet[];
  populations: Facet[];
  modalities: Facet[];
  tasks: Facet[];
  designs: Facet[];
  years: { min: number; max: number } | null;
}

export const getFacets = () => api<SynthesisFacets>('/api/syntheses/facets');

export const facetsQueryOptions = () => queryOptions({ queryKey: queryKeys.synthesis.facets(), queryFn: getFacets, staleTime: 60_000 });

export function useFacets() {
  return useQuery(facetsQueryOptions());
}
