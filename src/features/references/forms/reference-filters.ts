import { z } from 'zod';
import { referenceListQuerySchema, type ReferenceListQuery } from '../../../../shared/schemas/references';
import { SCREENING_STATUSES, type ScreeningStatus } from '../../../../shared/vocabulary/screening';
import { numberOrNothing, yearText } from '../../../lib/forms/fields';
import { taking } from '../../../lib/forms/resolver';

export interface ReferenceFilterValues {
  q: string;
  status: '' | ScreeningStatus;
  yearFrom: string;
  yearTo: string;
}
export const NO_FILTERS: ReferenceFilterValues = { q: '', status: '', yearFrom: '', yearTo: '' };

type Filters = Pick<ReferenceListQuery, 'q' | 'status' | 'yearFrom' | 'yearTo'>;
const filtersSchema = referenceListQuerySchema.pick({ q: true, status: true, yearFrom: true, yearTo: true });

/** The table's filter inputs as the list route's query (checked by its schema). */
export const referenceFiltersSchema = z
  .object({ q: z.string(), status: z.union([z.literal(''), z.enum(SCREENING_STATUSES)]), yearFrom: yearText, yearTo: yearText })
  .transform((v) => ({ q: v.q.trim() || undefined, status: v.status || undefined, yearFrom: numberOrNothing(v.yearFrom), yearTo: numberOrNothing(v.yearTo) }))
  .pipe(taking<{ q: string | undefined; status: Filters['status']; yearFrom: number | undefined; yearTo: number | undefined }>()(filtersSchema));
