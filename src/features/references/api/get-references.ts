import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ReferenceListQuery } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { Page, ReferenceSummary } from './types';

export const getReferences = (q: Partial<ReferenceListQuery>) => api<Page<ReferenceSummary>>(`/api/references${queryString(q)}`);

export const referencesQueryOptions = (q: Partial<ReferenceListQuery>) =>
  queryOptions({ queryKey: queryKeys.references.list(q), queryFn: () => getReferences(q), placeholderData: keepPreviousData });

export function useReferences(q: Partial<ReferenceListQuery>) {
  return useQuery(referencesQueryOptions(q));
}
