import { keepPreviousData, useQuery } from '@tanstack/react-query';
import type { SynthesisAnswer, SynthesisRequest, SynthesisRowSort } from '../../../../shared/schemas/synthesis';
import type { Page } from '../../../../shared/schemas/common';
import type { PooledRow } from '../../../../shared/synthesis/types';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface RowsPaging {
  page: number;
  pageSize: number;
  sort: SynthesisRowSort;
  order: 'asc' | 'desc';
}

/** One page of a synthesis's pooled rows, sorted on the server (POST /api/syntheses?rows=page); only the rows are kept. */
export async function getSynthesisRows(request: SynthesisRequest, paging: RowsPaging, signal?: AbortSignal): Promise<Page<PooledRow>> {
  const answer = await api<SynthesisAnswer>(`/api/syntheses${queryString({ rows: 'page', ...paging })}`, { body: request, signal });
  return { items: answer.rows, total: answer.rowsPage?.total ?? answer.rows.length, page: paging.page, pageSize: paging.pageSize };
}

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
