import { z } from 'zod';
import { referenceListQuerySchema, type ReferenceListQuery } from '../../../../shared/schemas/references';
import { SCREENING_STATUSES, type ScreeningStatus } from '../../../../shared/vocabulary/screening';
import { numericText, yearText } from '../../../lib/forms/fields';

export interface ReferenceFilterValues {
  q: string;
  status: '' | ScreeningStatus;
  yearFrom: string;
  yearTo: string;
}
export const NO_FILTERS: ReferenceFilterValues = { q: '', status: '', yearFrom: '', yearTo: '' };

const shape = referenceListQuerySchema.shape;

/** The table's filter inputs as the list route's query: each field checked by that route's rule for it. */
export const referenceFiltersSchema = z
  .object({
    q: z.string().transform((s) => s.trim() || undefined).pipe(shape.q),
    status: z.union([z.literal(''), z.enum(SCREENING_STATUSES)]).transform((s) => s || undefined),
    yearFrom: numericText(yearText, shape.yearFrom),
    yearTo: numericText(yearText, shape.yearTo),
  })
  .transform((v): Partial<ReferenceListQuery> => Object.fromEntries(Object.entries(v).filter(([, x]) => x !== undefined)));
