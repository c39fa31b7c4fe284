import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface PrismaCounts {
  identified: { total: number; bySource: Record<string, number> };
  duplicatesRemoved: { total: number; importDuplicates: number; merged: number };
  afterDuplicates: number;
  screened: number;
  awaitingScreening: number;
  excluded: { total: number; byReason: Record<string, number> };
  included: number;
}

export const getCounts = () => api<PrismaCounts>('/api/screening/counts');

export const countsQueryOptions = () => queryOptions({ queryKey: queryKeys.screening.counts(), queryFn: getCounts });

export function useCounts() {
  return useQuery(countsQueryOptions());
}
