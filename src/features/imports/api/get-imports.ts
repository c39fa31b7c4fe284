import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ImportPage } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface ImportsQuery {
  page: number;
  pageSize: number;
  sort?: 'created_at' | 'format' | 'total';
  order?: 'asc' | 'desc';
}

export const getImports = (q: ImportsQuery) => api<ImportPage>(`/api/imports${queryString({ ...q })}`);

export const importsQueryOptions = (q: ImportsQuery) => queryOptions({ queryKey: queryKeys.imports.list(q), queryFn: () => getImports(q), placeholderData: keepPreviousData });

export function useImports(q: ImportsQuery) {
  return useQuery(importsQueryOptions(q));
}
