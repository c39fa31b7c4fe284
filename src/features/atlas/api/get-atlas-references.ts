import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { AtlasReferencePage, AtlasReferencesQuery } from '../../../../shared/schemas/synthesis';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { AtlasReference } from '../../../../shared/schemas/synthesis';

export type ReferencesQuery = AtlasReferencesQuery;

/** What an atlas page's reference table asks for first (its loader fetches the same page). */
export const FIRST_REFERENCES_PAGE: ReferencesQuery = { page: 1, pageSize: 25, sort: 'year', order: 'asc' };

export const getAtlasReferences = (scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) =>
  api<AtlasReferencePage>(`/api/atlas/${scope}/${encodeURIComponent(slug)}/references${queryString({ ...q })}`);

export const atlasReferencesQueryOptions = (scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) =>
  queryOptions({ queryKey: queryKeys.atlas.references(scope, slug, q), queryFn: () => getAtlasReferences(scope, slug, q), placeholderData: keepPreviousData });

export function useAtlasReferences(scope: 'manipulations' | 'outcomes', slug: string, q: ReferencesQuery) {
  return useQuery(atlasReferencesQueryOptions(scope, slug, q));
}
