import { queryOptions, useQuery } from '@tanstack/react-query';
import type { ImportResult } from '../../../../shared/schemas/references';
import { api } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export const getImport = (id: number) => api<ImportResult>(`/api/imports/${id}`);

/** Polls while the batch is still running (DOI batches resolve in the background). */
export const importQueryOptions = (id: number) =>
  queryOptions({
    queryKey: queryKeys.imports.detail(id),
    queryFn: () => getImport(id),
    refetchInterval: (q) => (q.state.data?.batch.state === 'running' ? 700 : false),
  });

export function useImport(id: number | null) {
  return useQuery({ ...importQueryOptions(id ?? 0), enabled: id !== null });
}
