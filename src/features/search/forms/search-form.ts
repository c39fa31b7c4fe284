import { z } from 'zod';
import { searchQuerySchema, type SearchQuery } from '../../../../shared/schemas/references';
import { SCREENING_STATUSES, type ScreeningStatus } from '../../../../shared/vocabulary/screening';
import { OUTCOME_KINDS } from '../../../../shared/vocabulary/outcomes';
import { TASKS } from '../../../../shared/vocabulary/tasks';
import { numericText, taking, yearText } from '../../../lib/forms/fields';

export interface SearchValues {
  q: string;
  status: '' | ScreeningStatus;
  yearFrom: string;
  yearTo: string;
  manipulation?: string;
  outcome?: string;
  task?: string;
}
export type SearchFilters = Pick<SearchQuery, 'q'> & Partial<Pick<SearchQuery, 'status' | 'yearFrom' | 'yearTo' | 'manipulation' | 'outcome' | 'task'>>;
const blank = z.string().optional().transform((s) => s || undefined);

const shape = searchQuerySchema.shape;

/** The filter inputs as the search route's own query: each field checked by that route's rule for it. */
export const searchFormSchema = z
  .object({
    q: z.string().pipe(taking<string>()(shape.q)),
    status: z.union([z.literal(''), z.enum(SCREENING_STATUSES)]).transform((s) => s || undefined),
    yearFrom: numericText(yearText, shape.yearFrom),
    yearTo: numericText(yearText, shape.yearTo),
    manipulation: blank.pipe(shape.manipulation),
    outcome: blank.pipe(shape.outcome),
    task: blank.pipe(shape.task),
  })
  .transform((v): SearchFilters => Object.fromEntries(Object.entries(v).filter(([, x]) => x !== undefined)) as SearchFilters);

/** A search is shared by its address: ?q=…&status=…&yearFrom=…&yearTo=…&manipulation=…&outcome=…&task=…&page=… (page 1 and empty fields left out). */
export function searchValuesFromParams(p: URLSearchParams): SearchValues {
  const status = p.get('status') ?? '';
  return {
    q: p.get('q') ?? '',
    status: (SCREENING_STATUSES as readonly string[]).includes(status) ? (status as ScreeningStatus) : '',
    yearFrom: p.get('yearFrom') ?? '',
    yearTo: p.get('yearTo') ?? '',
    manipulation: p.get('manipulation') ?? '',
    outcome: (OUTCOME_KINDS as readonly string[]).includes(p.get('outcome') ?? '') ? p.get('outcome')! : '',
    task: (TASKS as readonly string[]).includes(p.get('task') ?? '') ? p.get('task')! : '',
  };
}

export const pageFromParams = (p: URLSearchParams) => Math.max(1, Math.floor(Number(p.get('page') ?? 1)) || 1);

export function searchParams(values: SearchValues, page: number): URLSearchParams {
  const next = new URLSearchParams();
  for (const [k, v] of Object.entries({ ...values, q: values.q.trim(), page: page > 1 ? String(page) : '' })) if (v) next.set(k, v);
  return next;
}
