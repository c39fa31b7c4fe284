import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { ManipulationListQuery, ManipulationPage } from '../../../../shared/schemas/registry';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { Manipulation } from '../../../../shared/schemas/registry';

export interface ManipulationsQuery {
  includeRetired?: boolean;
  sort?: ManipulationListQuery['sort'];
  order?: 'asc' | 'desc';
  page?: number;
  pageSize?: number;
}

/** Every term, retired ones too (a sheet may still name one), for the pickers. */
export const WHOLE_VOCABULARY: ManipulationsQuery = { includeRetired: true, pageSize: 200, sort: 'label' };
/** The terms in use, for choosing a new value. */
export const CURRENT_VOCABULARY: ManipulationsQuery = { pageSize: 200, sort: 'label' };

export const getManipulations = (q: ManipulationsQuery) => api<ManipulationPage>(`/api/manipulations${queryString({ ...q })}`);

export const manipulationsQueryOptions = (q: ManipulationsQuery = {}) =>
  queryOptions({ queryKey: queryKeys.manipulations.list(q), queryFn: () => getManipulations(q), placeholderData: keepPreviousData, staleTime: 60_000 });

export function useManipulations(q: ManipulationsQuery = {}) {
  return useQuery(manipulationsQueryOptions(q));
}
