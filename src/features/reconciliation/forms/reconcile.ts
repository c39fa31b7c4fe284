import { z } from 'zod';
import { reconcilePairSchema } from '../../../../shared/schemas/reconciliation';

/** One differing field as the form holds it: nothing chosen ('') until the curator picks a side or a value. */
export type DecisionInput = { discrepancyId: number; resolution: '' | 'a' | 'b' | 'value'; value: unknown; note: string };
export type ReconcileValues = { version: number; decisions: DecisionInput[]; rationale: string };

/** The whole reconciliation as the server takes it: every field's decision (an own value only when chosen). */
export const reconcileFormSchema = z
  .object({
    version: z.number(),
    decisions: z.array(z.object({ discrepancyId: z.number(), resolution: z.enum(['', 'a', 'b', 'value']), value: z.unknown(), note: z.string() })),
    rationale: z.string(),
  })
  .transform(
    (v): z.input<typeof reconcilePairSchema> => ({
      version: v.version,
      rationale: v.rationale,
      // a field left without a choice goes on as missing, so the server schema names it
      decisions: v.decisions.map((d) => ({ discrepancyId: d.discrepancyId, resolution: (d.resolution || undefined) as 'a', note: d.note, ...(d.resolution === 'value' ? { value: d.value } : {}) })),
    }),
  )
  .pipe(reconcilePairSchema);
