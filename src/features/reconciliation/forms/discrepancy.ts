import { z } from 'zod';
import { resolveDiscrepancySchema } from '../../../../shared/schemas/extraction';

/** A decision as the server takes it: the own value only when the curator enters one. */
export const discrepancyFormSchema = z
  .object({ resolution: z.enum(['a', 'b', 'value']), value: z.unknown(), rationale: z.string() })
  .transform((v) => ({ resolution: v.resolution, rationale: v.rationale, ...(v.resolution === 'value' ? { value: v.value } : {}) }))
  .pipe(resolveDiscrepancySchema);
