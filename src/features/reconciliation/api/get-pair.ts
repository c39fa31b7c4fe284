import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StoredStudy } from '../../../../shared/extraction/stored-sheet';
import { queryKeys } from '../../../lib/query/keys';

export interface PairSide {
  extractionId: number;
  coder: string;
  state: string;
  studies: StoredStudy[];
}
export interface DiscrepancyRow {
  id: number;
  path: string;
  field: string;
  label: string;
  valueA: unknown;
  valueB: unknown;
  status: 'open' | 'resolved';
  resolution: 'a' | 'b' | 'value' | null;
  resolvedValue: unknown;
  rationale: string | null;
  resolvedBy: string | null;
  resolvedAt: string | null;
}
export interface PairDetail {
  assignment: { id: number; state: string; version: number; referenceId: number; reference: { id: number; title: string; label: string; doi: string | null }; coder1: string; coder2: string; recordId: number | null };
  a: PairSide | null;
  b: PairSide | null;
  discrepancies: DiscrepancyRow[];
}

export const getPair = (id: number) => api<PairDetail>(`/api/reconciliation/${id}`);

export const pairQueryOptions = (id: number) => queryOptions({ queryKey: queryKeys.reconciliation.detail(id), queryFn: () => getPair(id) });

export function usePair(id: number) {
  return useQuery(pairQueryOptions(id));
}
