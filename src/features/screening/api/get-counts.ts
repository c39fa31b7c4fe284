import { queryOptions, useQuery } from '@tanstack/react-query';
import type { PrismaFlow } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type { PrismaFlow as PrismaCounts };

export const getCounts = () => api<PrismaFlow>('/api/screening/counts');

export const countsQueryOptions = () => queryOptions({ queryKey: queryKeys.screening.counts(), queryFn: getCounts });

export function useCounts() {
  return useQuery(countsQueryOptions());
}
