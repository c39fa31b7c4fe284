import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import type { EntryStatus, ImportResult } from '../../../../shared/schemas/references';
import { api, queryString } from '../../../lib/api-client';
import { queryKeys } from '../../../lib/query/keys';

export interface EntriesQuery {
  page: number;
  status: EntryStatus | '';
  /** Changes as a running batch progresses, so the page is asked for again. */
  processed: number;
  /** Look-ups waiting for the resolver: their entries' messages change without progress. */
  unreachable: number;
}

export const getImportEntries = (id: number, q: EntriesQuery) =>
  api<ImportResult>(`/api/imports/${id}${queryString({ entryPage: q.page, entryPageSize: 100, entryStatus: q.status || undefined })}`);

export const importEntriesQueryOptions = (id: number, q: EntriesQuery) =>
  queryOptions({ queryKey: queryKeys.imports.entries(id, q), queryFn: () => getImportEntries(id, q), placeholderData: keepPreviousData });

/** One page of a batch's entries, asked of the server (a batch may hold thousands). */
export function useImportEntries(id: number, q: EntriesQuery) {
  return useQuery(importEntriesQueryOptions(id, q));
}
