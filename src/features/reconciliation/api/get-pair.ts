import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PairDetail } from '../../../../shared/schemas/reconciliation';
import { queryKeys } from '../../../lib/query/keys';

export type { Discrepancy as DiscrepancyRow, PairDetail, PairSide } from '../../../../shared/schemas/reconciliation';

export const getPair = (id: number) => api<PairDetail>(`/api/reconciliation/${id}`);

export const pairQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.reconciliation.detail(id), queryFn: () => getPair(id) });

export function usePair(id: number) {
  return useQuery(pairQueryOptions(id));
}
