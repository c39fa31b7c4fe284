// Double coding: assignments, the reconciliation queue, settled records and inter-coder agreement.
import { z } from 'zod';
import { idParam, pageSchema, pagingSchema, timestamp } from './common.js';
import { EXTRACTION_STATES, storedStudySchema } from './extraction.js';

export const ASSIGNMENT_STATES = ['coding', 'matched', 'disputed', 'settled', 'withdrawn'] as const;
export type AssignmentState = (typeof ASSIGNMENT_STATES)[number];

// ---- assignments (curators)

export const assignmentListQuerySchema = pagingSchema(['id', 'updated', 'reference'] as const, 'updated', { order: 'desc' }).extend({
  state: z.enum(ASSIGNMENT_STATES).optional(),
});
export type AssignmentListQuery = z.infer<typeof assignmentListQuerySchema>;

export const assignmentSchema = z.object({
  id: z.number().int(),
  referenceId: z.number().int(),
  referenceLabel: z.string(),
  title: z.string(),
  state: z.enum(ASSIGNMENT_STATES),
  coder1: z.string(),
  coder2: z.string(),
  submitted: z.number().int(),
  openDiscrepancies: z.number().int(),
  createdAt: timestamp,
  updatedAt: timestamp,
});
export type Assignment = z.infer<typeof assignmentSchema>;
export const assignmentPageSchema = pageSchema(assignmentSchema);
export type AssignmentPage = z.infer<typeof assignmentPageSchema>;

export const candidateQuerySchema = pagingSchema(['reference', 'year', 'id'] as const, 'reference').extend({
  q: z.string().trim().max(200).optional(),
  status: z.enum(['unassigned', 'any']).default('unassigned'),
});
export type CandidateQuery = z.infer<typeof candidateQuerySchema>;

export const claimSchema = z.object({ extractionId: z.number().int(), coderId: z.number().int(), coder: z.string(), state: z.enum(['draft', 'submitted']) });
export type Claim = z.infer<typeof claimSchema>;

export const candidateSchema = z.object({
  id: z.number().int(),
  title: z.string(),
  referenceLabel: z.string(),
  year: z.number().int().nullable(),
  doi: z.string().nullable(),
  assignmentState: z.enum(ASSIGNMENT_STATES).nullable(),
  settled: z.boolean(),
  /** coding sheets of this reference in no pair yet; an assignment adopts them */
  claims: z.array(claimSchema),
});
export type Candidate = z.infer<typeof candidateSchema>;
export const candidatePageSchema = pageSchema(candidateSchema);
export type CandidatePage = z.infer<typeof candidatePageSchema>;

export const coderSchema = z.object({ id: z.number().int(), login: z.string(), name: z.string().nullable(), curator: z.boolean(), you: z.boolean() });
export type Coder = z.infer<typeof coderSchema>;
export const coderListSchema = z.object({
  items: z.array(coderSchema),
  /** a curator may code a pair only when another curator, outside the pair, can reconcile it */
  selfAssignable: z.boolean(),
  otherCurators: z.array(z.string()),
});
export type CoderList = z.infer<typeof coderListSchema>;

/** POST /api/assignments */
export const createdAssignmentSchema = z.object({
  id: z.number().int(),
  extractionIds: z.array(z.number().int()),
  /** coding after a fresh pairing; settled or disputed when two submitted claims were compared at once */
  state: z.enum(ASSIGNMENT_STATES),
  /** the claims the pair took over, with the state each kept */
  adopted: z.array(claimSchema),
  discrepancies: z.number().int(),
});
export type CreatedAssignment = z.infer<typeof createdAssignmentSchema>;

// ---- the reconciliation queue

export const reconciliationQuerySchema = pagingSchema(['updated', 'reference', 'open'] as const, 'updated');
export type ReconciliationQuery = z.infer<typeof reconciliationQuerySchema>;

export const disputedPairSchema = z.object({
  assignmentId: z.number().int(),
  referenceId: z.number().int(),
  referenceLabel: z.string(),
  title: z.string(),
  coder1: z.string(),
  coder2: z.string(),
  openDiscrepancies: z.number().int(),
  discrepancies: z.number().int(),
  updatedAt: timestamp,
  /** the asking curator coded this pair, so another curator reconciles it */
  youCoded: z.boolean(),
});
export type DisputedPair = z.infer<typeof disputedPairSchema>;

export const reopenedRecordSchema = z.object({
  recordId: z.number().int(),
  referenceId: z.number().int(),
  referenceLabel: z.string(),
  title: z.string(),
  recordVersion: z.number().int().nullable(),
  reason: z.string().nullable(),
  updatedAt: timestamp,
});
export type ReopenedRecord = z.infer<typeof reopenedRecordSchema>;

/** GET /api/reconciliation: disputed pairs (paged) and reopened records waiting to be settled again. */
export const reconciliationQueueSchema = pageSchema(disputedPairSchema).extend({ reopened: z.array(reopenedRecordSchema) });
export type ReconciliationQueue = z.infer<typeof reconciliationQueueSchema>;

/** One effect a coder's sheet gives at a discrepancy's place (the effect itself, or each effect of its study). */
export const impliedEffectSchema = z.object({
  label: z.string(),
  metric: z.string().nullable(),
  effect: z.number().nullable(),
  variance: z.number().nullable(),
});
export type ImpliedEffect = z.infer<typeof impliedEffectSchema>;

export const discrepancySchema = z.object({
  id: z.number().int(),
  path: z.string(),
  field: z.string(),
  label: z.string(),
  valueA: z.unknown(),
  valueB: z.unknown(),
  /** the effects coder A's and coder B's sheets compute where this field sits */
  impliedA: z.array(impliedEffectSchema),
  impliedB: z.array(impliedEffectSchema),
  status: z.enum(['open', 'resolved']),
  resolution: z.enum(['a', 'b', 'value']).nullable(),
  resolvedValue: z.unknown(),
  rationale: z.string().nullable(),
  resolvedBy: z.string().nullable(),
  resolvedAt: timestamp.nullable(),
});
export type Discrepancy = z.infer<typeof discrepancySchema>;

export const pairSideSchema = z.object({ extractionId: z.number().int(), coder: z.string(), state: z.enum(EXTRACTION_STATES), studies: z.array(storedStudySchema) });
export type PairSide = z.infer<typeof pairSideSchema>;

/** GET /api/reconciliation/:id: both codings side by side (a draft side shows no studies) and the discrepancies. */
export const pairDetailSchema = z.object({
  assignment: z.object({
    id: z.number().int(),
    state: z.enum(ASSIGNMENT_STATES),
    version: z.number().int(),
    referenceId: z.number().int(),
    reference: z.object({ id: z.number().int(), title: z.string(), label: z.string(), doi: z.string().nullable() }),
    coder1: z.string(),
    coder2: z.string(),
    recordId: z.number().int().nullable(),
  }),
  a: pairSideSchema.nullable(),
  b: pairSideSchema.nullable(),
  discrepancies: z.array(discrepancySchema),
});
export type PairDetail = z.infer<typeof pairDetailSchema>;

/** PUT /api/reconciliation/:id/discrepancies/:discrepancyId */
export const resolvedDiscrepancySchema = z.object({
  discrepancy: discrepancySchema.pick({ id: true, status: true, resolution: true, resolvedValue: true, rationale: true }),
});
export type ResolvedDiscrepancy = z.infer<typeof resolvedDiscrepancySchema>;

/** POST /api/reconciliation/:id/settle: the new settled record. */
export const settledRecordSchema = z.object({
  recordId: z.number().int(),
  recordVersion: z.number().int(),
  registryVersion: z.number().int(),
  studyIds: z.array(z.number().int()),
  effectIds: z.array(z.number().int()),
});
export type SettledRecord = z.infer<typeof settledRecordSchema>;

/** POST /api/reconciliation/:id/reconcile: every field's decision and the settlement, in one transaction. */
export const reconcilePairSchema = z
  .object({
    /** the pair's version the curator read */
    version: z.number().int().min(1),
    decisions: z
      .array(
        z.object({
          discrepancyId: z.number().int().min(1).max(2147483647),
          resolution: z.enum(['a', 'b', 'value'], { error: 'choose coder A, coder B or your own value' }),
          value: z.unknown().optional(),
          /** this field's own reason; the settlement's rationale stands for fields without one */
          note: z.string().trim().max(2000).default(''),
        })
        .refine((d) => d.resolution !== 'value' || d.value !== undefined, { path: ['value'], message: 'enter the value to keep' }),
      )
      .min(1, 'decide at least one field')
      .max(500),
    rationale: z.string().trim().min(3, 'say why (at least 3 characters)').max(2000),
  })
  .superRefine((v, ctx) => {
    const seen = new Set<number>();
    v.decisions.forEach((d, i) => {
      if (seen.has(d.discrepancyId)) ctx.addIssue({ code: 'custom', path: ['decisions', i, 'discrepancyId'], message: 'this field is decided twice' });
      seen.add(d.discrepancyId);
    });
  });
export type ReconcilePairInput = z.infer<typeof reconcilePairSchema>;

/** POST /api/reconciliation/:id/reconcile */
export const reconciledPairSchema = settledRecordSchema.extend({ assignmentId: z.number().int(), decided: z.number().int() });
export type ReconciledPair = z.infer<typeof reconciledPairSchema>;

// ---- settled records

export const recordListQuerySchema = z.object({ referenceId: idParam });

/** GET /api/records?referenceId=: every version of a reference's settled record and what happened to it. */
export const recordHistorySchema = z.object({
  records: z.array(
    z.object({
      id: z.number().int(),
      state: z.enum(EXTRACTION_STATES),
      recordVersion: z.number().int().nullable(),
      current: z.boolean(),
      supersededBy: z.number().int().nullable(),
      reopenReason: z.string().nullable(),
      settledAt: timestamp.nullable(),
      createdAt: timestamp,
      updatedBy: z.string().nullable(),
    }),
  ),
  settlements: z.array(
    z.object({
      id: z.number().int(),
      recordId: z.number().int(),
      kind: z.enum(['matched', 'reconciled', 'direct', 'reopened', 'withdrawn', 'edited', 'restored']),
      by: z.string().nullable(),
      rationale: z.string(),
      at: timestamp,
    }),
  ),
});
export type RecordHistory = z.infer<typeof recordHistorySchema>;

/** POST /api/records/:id/reopen and /settle */
export const recordVersionResultSchema = z.object({ recordId: z.number().int(), recordVersion: z.number().int(), registryVersion: z.number().int() });
export type RecordVersionResult = z.infer<typeof recordVersionResultSchema>;
/** POST /api/records/:id/withdraw */
export const withdrawnRecordSchema = z.object({ recordId: z.number().int(), state: z.literal('withdrawn'), registryVersion: z.number().int() });
export type WithdrawnRecord = z.infer<typeof withdrawnRecordSchema>;

// ---- agreement between coders

export const agreementQuerySchema = pagingSchema(['reference', 'agreement'] as const, 'agreement');
export type AgreementQuery = z.infer<typeof agreementQuerySchema>;

/** icc is null when fewer than 5 pairs of values exist; iccNote then says why in words. */
const effectAgreementSchema = z.object({ metric: z.string(), items: z.number().int(), icc: z.number().nullable(), iccNote: z.string().nullable() });
const pooledAgreementSchema = z.object({ items: z.number().int(), percentAgreement: z.number().nullable(), kappa: z.number().nullable() });

export const agreementSummarySchema = z.object({
  pairs: z.number().int(),
  categorical: z.array(z.object({ field: z.string(), items: z.number().int(), percentAgreement: z.number().nullable(), kappa: z.number().nullable(), kappaSe: z.number().nullable() })),
  allCategorical: pooledAgreementSchema,
  effectSizes: z.array(effectAgreementSchema),
});
export type AgreementSummary = z.infer<typeof agreementSummarySchema>;

/** GET /api/agreement */
export const overallAgreementSchema = z.object({
  overall: agreementSummarySchema,
  coderPairs: z.array(agreementSummarySchema.extend({ coders: z.string() })),
});
export type OverallAgreement = z.infer<typeof overallAgreementSchema>;

export const referenceAgreementSchema = pooledAgreementSchema.extend({
  assignmentId: z.number().int(),
  referenceId: z.number().int(),
  referenceLabel: z.string(),
  coders: z.string(),
  effectSizes: z.array(effectAgreementSchema),
});
export type ReferenceAgreement = z.infer<typeof referenceAgreementSchema>;
export const referenceAgreementPageSchema = pageSchema(referenceAgreementSchema);
export type ReferenceAgreementPage = z.infer<typeof referenceAgreementPageSchema>;

/** GET /api/agreement/references/:id */
export const agreementForReferenceSchema = agreementSummarySchema.extend({ referenceId: z.number().int() });
export type AgreementForReference = z.infer<typeof agreementForReferenceSchema>;
