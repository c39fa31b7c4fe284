import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ReferenceListQuery, ReferencePage } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

/** How the references table opens (its loader fetches the same page). */
export const FIRST_REFERENCES_PAGE = { page: 1, pageSize: 50, sort: 'created_at', order: 'desc' } as const satisfies Partial<ReferenceListQuery>;
export const firstReferencesQuery = (batch?: number): Partial<ReferenceListQuery> => ({ ...FIRST_REFERENCES_PAGE, ...(batch ? { batch } : {}) });

export const getReferences = (q: Partial<ReferenceListQuery>) => api<ReferencePage>(`/api/references${queryString(q)}`);

export const referencesQueryOptions = (q: Partial<ReferenceListQuery>) =>
  queryOptions({ queryKey: queryKeys.references.list(q), queryFn: () => getReferences(q), placeholderData: keepPreviousData });

export function useReferences(q: Partial<ReferenceListQuery>) {
  return useQuery(referencesQueryOptions(q));
}
