import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface ReferencesQuery {
  page: number;
  pageSize: number;
  sort: 'year' | 'label' | 'title' | 'effects';
  order: 'asc' | 'desc';
}

/** What an atlas page's reference table asks for first (its loader fetches the same page). */
export const FIRST_REFERENCES_PAGE: ReferencesQuery = { page: 1, pageSize: 25, sort: 'year', order: 'asc' };

export interface AtlasReference {
  id: number;
  label: string;
  title: string;
  year: number | null;
  doi: string | null;
  studies: number;
  effects: number;
}

export const getAtlasReferences = (scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) =>
  api<{ items: AtlasReference[]; total: number; page: number; pageSize: number }>(`/api/atlas/${scope}/${encodeURIComponent(slug)}/references${queryString({ ...q })}`);

export const atlasReferencesQueryOptions = (scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) =>
  queryOptions({ queryKey: queryKeys.atlas.references(scope, slug, q), queryFn: () => getAtlasReferences(scope, slug, q), placeholderData: keepPreviousData });

export function useAtlasReferences(scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) {
  return useQuery(atlasReferencesQueryOptions(scope, slug, q));
}
