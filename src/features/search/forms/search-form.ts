import { z } from 'zod';
import { searchQuerySchema, type SearchQuery } from '../../../../shared/schemas/references';
import { SCREENING_STATUSES, type ScreeningStatus } from '../../../../shared/vocabulary/screening';
import { numberOrNothing, yearText } from '../../../lib/forms/fields';
import { taking } from '../../../lib/forms/resolver';

export interface SearchValues {
  q: string;
  status: '' | ScreeningStatus;
  yearFrom: string;
  yearTo: string;
}
export type SearchFilters = Pick<SearchQuery, 'q'> & Partial<Pick<SearchQuery, 'status' | 'yearFrom' | 'yearTo'>>;

const filtersSchema = searchQuerySchema.pick({ q: true, status: true, yearFrom: true, yearTo: true });

/** The filter inputs as the search route's own query (its schema checks the words and years too). */
export const searchFormSchema = z
  .object({ q: z.string(), status: z.union([z.literal(''), z.enum(SCREENING_STATUSES)]), yearFrom: yearText, yearTo: yearText })
  .transform((v) => ({ q: v.q, status: v.status || undefined, yearFrom: numberOrNothing(v.yearFrom), yearTo: numberOrNothing(v.yearTo) }))
  .pipe(taking<{ q: string; status: SearchQuery['status'] | undefined; yearFrom: number | undefined; yearTo: number | undefined }>()(filtersSchema));

/** A search is shared by its address: ?q=…&status=…&yearFrom=…&yearTo=…&page=… (page 1 and empty fields left out). */
export function searchValuesFromParams(p: URLSearchParams): SearchValues {
  const status = p.get('status') ?? '';
  return {
    q: p.get('q') ?? '',
    status: (SCREENING_STATUSES as readonly string[]).includes(status) ? (status as ScreeningStatus) : '',
    yearFrom: p.get('yearFrom') ?? '',
    yearTo: p.get('yearTo') ?? '',
  };
}

export const pageFromParams = (p: URLSearchParams) => Math.max(1, Math.floor(Number(p.get('page') ?? 1)) || 1);

export function searchParams(values: SearchValues, page: number): URLSearchParams {
  const next = new URLSearchParams();
  for (const [k, v] of Object.entries({ ...values, q: values.q.trim(), page: page > 1 ? String(page) : '' })) if (v) next.set(k, v);
  return next;
}
