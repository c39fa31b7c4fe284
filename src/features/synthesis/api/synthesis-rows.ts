import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { z } from 'zod';
import type { SynthesisRequest, SynthesisTableSort, synthesisTablePageSchema } from '../../../../shared/schemas/synthesis';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export type SynthesisTablePage = z.infer<typeof synthesisTablePageSchema>;
export interface RowsPaging {
  page: number;
  pageSize: number;
  sort: SynthesisTableSort;
  order: 'asc' | 'desc';
}

export const getSynthesisRows = (request: SynthesisRequest, paging: RowsPaging, signal?: AbortSignal) =>
  api<SynthesisTablePage>('/api/syntheses/rows', { body: { request, ...paging }, signal });

/** One page of a long synthesis's pooled rows, sorted on the server; off (enabled: false) while the answer's own first page serves. */
export function useSynthesisRows(request: SynthesisRequest, paging: RowsPaging, enabled: boolean) {
  return useQuery({
    queryKey: queryKeys.synthesis.rows(request, paging),
    queryFn: ({ signal }) => getSynthesisRows(request, paging, signal),
    placeholderData: keepPreviousData,
    enabled,
    staleTime: 30_000,
  });
}
