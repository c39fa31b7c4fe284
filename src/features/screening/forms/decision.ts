import { z } from 'zod';
import { screeningDecisionFieldsSchema } from '../../../../shared/schemas/references';
import { SCREENING_DECISIONS } from '../../../../shared/vocabulary/screening';

/** The form's choices as the server's decision: a reason only with an exclusion, a note only when written. */
export const decisionFormSchema = z
  .object({ decision: z.enum(SCREENING_DECISIONS), reason: z.string(), note: z.string() })
  .transform(
    (v): Record<string, unknown> => ({
      decision: v.decision,
      ...(v.decision === 'excluded' && v.reason ? { reason: v.reason } : {}),
      ...(v.note.trim() ? { note: v.note.trim() } : {}),
    }),
  )
  .pipe(screeningDecisionFieldsSchema);
