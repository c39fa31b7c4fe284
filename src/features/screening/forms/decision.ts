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

export type DecisionValues = { decision: z.infer<typeof decisionFormSchema>['decision']; reason: string; note: string };

/** What the form starts from: the reference's current decision (newest not undone), or an inclusion with nothing written. */
export function decisionDefaults(current?: { decision: DecisionValues['decision']; reason: string | null; note: string | null } | null): DecisionValues {
  if (!current) return { decision: 'included', reason: '', note: '' };
  return { decision: current.decision, reason: current.decision === 'excluded' ? (current.reason ?? '') : '', note: current.note ?? '' };
}
