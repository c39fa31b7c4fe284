import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';
import type { ReferenceDetail } from './types';

export const getReference = (id: number) => api<ReferenceDetail>(`/api/references/${id}`);

export const referenceQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.references.detail(id), queryFn: () => getReference(id) });

export function useReference(id: number) {
  return useQuery(referenceQueryOptions(id));
}
