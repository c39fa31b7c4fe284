import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ImportResult } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

/** The batch with the first page of its entries (the report's pages come from get-import-entries). */
export const getImport = (id: number) => api<ImportResult>(`/api/imports/${id}${queryString({ entryPage: 1 })}`);

/** Batches still at work: DOI look-ups, and large BibTeX/RIS imports read by a job. */
export const batchAtWork = (state: ImportResult['batch']['state'] | undefined) => state === 'queued' || state === 'running';

/** Polls while the batch is queued or running. */
export const importQueryOptions = (id: number) =>
  queryOptions({
    queryKey: queryKeys.imports.detail(id),
    queryFn: () => getImport(id),
    refetchInterval: (q) => (batchAtWork(q.state.data?.batch.state) ? 700 : false),
  });

export function useImport(id: number | null) {
  return useQuery({ ...importQueryOptions(id ?? 0), enabled: id !== null });
}
