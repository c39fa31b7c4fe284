import { z } from 'zod';
import { screeningDecisionFieldsSchema } from '../../../../shared/schemas/references';
import { SCREENING_DECISIONS, STAGE_REASONS, type ScreeningStage } from '../../../../shared/vocabulary/screening';

/**
 * The form's choices as the server's decision at a stage: a reason only with an exclusion (one of the stage's; a
 * full-text exclusion needs one), a note only when written.
 */
export const decisionFormSchema = (stage: ScreeningStage) =>
  z
  .object({ decision: z.enum(SCREENING_DECISIONS), reason: z.string(), note: z.string() })
  .superRefine((v, ctx) => {
    if (v.decision !== 'excluded') return;
    if (!v.reason && stage === 'full_text') ctx.addIssue({ code: 'custom', path: ['reason'], message: 'a full-text exclusion needs a reason' });
    if (v.reason && !(STAGE_REASONS[stage] as readonly string[]).includes(v.reason)) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'pick a reason of this stage' });
  })
  .transform(
    (v): Record<string, unknown> => ({
      decision: v.decision,
      ...(v.decision === 'excluded' && v.reason ? { reason: v.reason } : {}),
      ...(v.note.trim() ? { note: v.note.trim() } : {}),
      stage,
    }),
  )
  .pipe(screeningDecisionFieldsSchema);

export type DecisionValues = { decision: (typeof SCREENING_DECISIONS)[number]; reason: string; note: string };

/** What the form starts from: the reference's current decision (newest not undone), or an inclusion with nothing written. */
export function decisionDefaults(current?: { decision: DecisionValues['decision']; reason: string | null; note: string | null } | null): DecisionValues {
  if (!current) return { decision: 'included', reason: '', note: '' };
  return { decision: current.decision, reason: current.decision === 'excluded' ? (current.reason ?? '') : '', note: current.note ?? '' };
}
