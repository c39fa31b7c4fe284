import { z } from 'zod';
import { EXCLUSION_REASONS, SCREENING_DECISIONS, SCREENING_STAGES } from '../vocabulary/screening.js';
import { actorSchema, timestamp } from './common.js';
import { referenceSummarySchema } from './references.js';

/** The project's screening rule: one screener decides each record, or two decide it independently and blind. */
export const SCREENER_COUNTS = [1, 2] as const;
export const screeningRuleInputSchema = z.object({
  screeners: z.union([z.literal(1), z.literal(2)], { message: 'screeners must be 1 or 2' }),
});
export type ScreeningRuleInput = z.infer<typeof screeningRuleInputSchema>;

/** GET/PUT /api/screening/rule */
export const screeningRuleSchema = z.object({
  screeners: z.union([z.literal(1), z.literal(2)]),
  /** null while the rule has never been set (one screener) */
  updatedAt: timestamp.nullable(),
  updatedBy: actorSchema.nullable(),
});
export type ScreeningRule = z.infer<typeof screeningRuleSchema>;

/** GET /api/screening/conflicts?stage= (curators) */
export const screeningConflictsQuerySchema = z.object({
  stage: z.enum(SCREENING_STAGES, { message: 'stage must be title_abstract or full_text' }).default('title_abstract'),
  limit: z.coerce.number().int().min(1).max(100).default(50),
});
export const screeningVoteSchema = z.object({
  id: z.number().int(),
  screener: actorSchema.nullable(),
  decision: z.enum(SCREENING_DECISIONS),
  reason: z.string().nullable(),
  note: z.string().nullable(),
  decidedAt: timestamp,
});
export const screeningConflictsSchema = z.object({
  stage: z.enum(SCREENING_STAGES),
  items: z.array(referenceSummarySchema.extend({ version: z.number().int(), abstract: z.string().nullable(), votes: z.array(screeningVoteSchema) })),
  /** Disagreements at this stage the caller may settle (not those they screened themselves). */
  total: z.number().int(),
  /** Disagreements where the caller was one of the screeners: another curator settles those. */
  ownVotes: z.number().int(),
});
export type ScreeningConflicts = z.infer<typeof screeningConflictsSchema>;

/** POST /api/screening/conflicts/:id/settle: the curator's outcome, with why, against the version they saw. */
export const screeningSettleSchema = z
  .object({
    stage: z.enum(SCREENING_STAGES, { message: 'stage must be title_abstract or full_text' }),
    decision: z.enum(SCREENING_DECISIONS, { message: 'decision must be included or excluded' }),
    reason: z.enum(EXCLUSION_REASONS, { message: 'pick a reason from the list' }).optional(),
    rationale: z.string({ message: 'say why you settle it this way' }).trim().min(3, 'say why you settle it this way (at least 3 characters)').max(2000),
    version: z.number({ message: 'send the reference version you saw' }).int().positive(),
  })
  .superRefine((v, ctx) => {
    if (v.decision === 'included' && v.reason) ctx.addIssue({ code: 'custom', path: ['reason'], message: 'an inclusion takes no exclusion reason' });
  });
export type ScreeningSettleInput = z.infer<typeof screeningSettleSchema>;

/** GET /api/screening/agreement: the two screeners' agreement per stage over settled pairs, and open disagreements. */
const stageAgreementSchema = z.object({
  pairs: z.number().int(),
  agreed: z.number().int(),
  /** null without pairs */
  percentAgreement: z.number().nullable(),
  /** Cohen's κ over the categories included / excluded for each reason; null without pairs or when one category was used throughout */
  kappa: z.number().nullable(),
  se: z.number().nullable(),
  /** in words, when κ is missing or rests on few pairs */
  caution: z.string().nullable(),
  /** records whose two decisions disagree, waiting for a curator */
  conflicts: z.number().int(),
});
export const screeningAgreementSchema = z.object({
  screeners: z.union([z.literal(1), z.literal(2)]),
  stages: z.object({ title_abstract: stageAgreementSchema, full_text: stageAgreementSchema }),
});
export type ScreeningAgreementCounts = z.infer<typeof screeningAgreementSchema>;
