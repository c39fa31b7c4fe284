import { z } from 'zod';
import { DESIGNS } from '../vocabulary/designs.js';
import { MODALITIES } from '../vocabulary/modalities.js';
import { OUTCOME_KINDS, OUTCOMES, METRIC_LABELS } from '../vocabulary/outcomes.js';
import { PARAMETERS, UNITS, quantityProblem } from '../vocabulary/parameters.js';
import { POPULATIONS } from '../vocabulary/populations.js';
import { TASKS } from '../vocabulary/tasks.js';
import { REPORT_FORMS, REPORTED_KEYS, METRICS_OF_FORM, tryComputeReported, type Reported } from '../extraction/compute.js';
import { METRICS } from '../stats/metrics.js';
import { idParam, pageSchema, pagingSchema, timestamp } from './common.js';
import { derivationSchema } from './trials.js';

/** Empty form inputs (NaN from valueAsNumber, '' or null) mean "not reported". */
const blank = (v: unknown) => (v === '' || v === null || (typeof v === 'number' && Number.isNaN(v)) ? undefined : v);
const optNumber = z.preprocess(blank, z.coerce.number().finite('must be a finite number').optional());
const optInt = z.preprocess(blank, z.coerce.number().int('must be a whole number').min(1, 'must be at least 1').optional());
const optText = (max: number) => z.preprocess(blank, z.string().trim().max(max, `at most ${max} characters`).optional());

export const termSchema = z
  .string()
  .trim()
  .min(2, 'at least 2 characters')
  .max(60, 'at most 60 characters')
  .regex(/^[a-z0-9]+(_[a-z0-9]+)*$/, 'lower-case letters, digits and single underscores (e.g. emotional_arousal)');

export const reportedSchema = z.object(
  Object.fromEntries(REPORTED_KEYS.map((k) => [k, optNumber])) as Record<(typeof REPORTED_KEYS)[number], typeof optNumber>,
);

/** One effect as a coder saves it in a draft: anything may still be missing. */
export const effectDraftSchema = z.object({
  label: z.preprocess(blank, z.string().trim().max(200, 'at most 200 characters').default('')),
  outcome: z.preprocess(blank, z.enum(OUTCOME_KINDS, 'choose an outcome kind').optional()),
  manipulation: z.preprocess(blank, termSchema.optional()),
  /** what was measured and in which unit (blank: the outcome kind's usual ones, shown on the sheet) */
  parameter: z.preprocess(blank, z.enum(PARAMETERS, 'choose what was measured').optional()),
  unit: z.preprocess(blank, z.enum(UNITS, 'choose a unit').optional()),
  form: z.preprocess(blank, z.enum(REPORT_FORMS, 'choose how the result was reported').optional()),
  reported: reportedSchema.default({}),
  assumedR: z.preprocess(blank, z.coerce.number().gt(-1, 'must be above −1').lt(1, 'must be below 1').optional()),
  page: optText(40),
  locator: optText(120),
  quote: optText(600),
  /** set when the effect was derived from trial data (the server refreshes its numbers from the fits) */
  derivation: derivationSchema.optional(),
});

export const studyDraftSchema = z.object({
  label: z.preprocess(blank, z.string().trim().max(120, 'at most 120 characters').default('')),
  design: z.preprocess(blank, z.enum(DESIGNS, 'choose within or between').optional()),
  n1: optInt,
  n2: optInt,
  population: z.preprocess(blank, z.enum(POPULATIONS, 'choose a population').optional()),
  diagnosis: optText(120),
  modality: z.preprocess(blank, z.enum(MODALITIES, 'choose a modality').optional()),
  task: z.preprocess(blank, z.enum(TASKS, 'choose a task').optional()),
  standardMs: z.preprocess(blank, z.coerce.number().finite().positive('must be above 0 ms').optional()),
  effects: z.array(effectDraftSchema).max(50, 'at most 50 effects per study').default([]),
});

export const sheetDraftSchema = z.object({
  studies: z.array(studyDraftSchema).max(30, 'at most 30 studies per reference').default([]),
  notes: z.preprocess(blank, z.string().max(4000).default('')),
});

export type EffectSheet = z.infer<typeof effectDraftSchema>;
export type StudySheet = z.infer<typeof studyDraftSchema>;
export type Sheet = z.infer<typeof sheetDraftSchema>;
/** What the form holds before parsing (inputs may be strings or NaN). */
export type SheetInput = z.input<typeof sheetDraftSchema>;

const required = (ctx: z.RefinementCtx, path: (string | number)[], message: string) => ctx.addIssue({ code: 'custom', path, message });

/** Checks a sheet is complete enough to submit or settle; every effect must compute. */
export function checkSheetComplete(sheet: Sheet, ctx: z.RefinementCtx) {
  if (sheet.studies.length === 0) required(ctx, ['studies'], 'add at least one study');
  sheet.studies.forEach((s, i) => {
    const p = ['studies', i];
    if (!s.design) required(ctx, [...p, 'design'], 'choose within or between');
    if (!s.population) required(ctx, [...p, 'population'], 'choose a population');
    if (s.population === 'clinical' && !s.diagnosis) required(ctx, [...p, 'diagnosis'], 'name the diagnosis of the clinical group');
    if (!s.modality) required(ctx, [...p, 'modality'], 'choose a modality');
    if (!s.task) required(ctx, [...p, 'task'], 'choose a task');
    if (s.n1 === undefined) required(ctx, [...p, 'n1'], 'give the sample size');
    if (s.design === 'between' && s.n2 === undefined) required(ctx, [...p, 'n2'], 'give the second group’s sample size');
    if (s.effects.length === 0) required(ctx, [...p, 'effects'], 'add at least one effect');
    s.effects.forEach((e, j) => {
      const q = [...p, 'effects', j];
      if (!e.outcome) required(ctx, [...q, 'outcome'], 'choose an outcome kind');
      if (!e.manipulation) required(ctx, [...q, 'manipulation'], 'choose a manipulation');
      const quantity = quantityProblem(e, (k) => OUTCOMES[k].label);
      if (quantity) required(ctx, [...q, quantity.field], quantity.message);
      if (!e.form) {
        required(ctx, [...q, 'form'], 'choose how the result was reported');
        return;
      }
      const formMetrics = METRICS_OF_FORM[e.form];
      if (e.outcome && !formMetrics.some((m) => OUTCOMES[e.outcome!].metrics.includes(m))) {
        required(
          ctx,
          [...q, 'form'],
          `${OUTCOMES[e.outcome].label} is pooled as ${OUTCOMES[e.outcome].metrics.map((m) => METRIC_LABELS[m]).join(' or ')}, not ${formMetrics.map((m) => METRIC_LABELS[m]).join(' or ')}`,
        );
        return;
      }
      const attempt = tryComputeReported(e.form, e.reported as Reported, e.assumedR ?? null);
      if (attempt.ok && e.outcome && !OUTCOMES[e.outcome].metrics.includes(attempt.result!.metric))
        required(ctx, [...q, 'form'], `${OUTCOMES[e.outcome].label} is not pooled as ${METRIC_LABELS[attempt.result!.metric]}`);
      if (!attempt.ok) required(ctx, attempt.field ? [...q, 'reported', attempt.field] : [...q, 'reported'], attempt.error!);
    });
  });
}

export const sheetSubmitSchema = sheetDraftSchema.superRefine(checkSheetComplete);

/** Saving a draft: the sheet and the version the coder last saw (a stale version gets 409). */
export const saveExtractionSchema = z.object({ version: z.coerce.number().int().min(1), sheet: sheetDraftSchema });
export const submitExtractionSchema = z.object({ version: z.coerce.number().int().min(1) });

export const EXTRACTION_STATES = ['draft', 'submitted', 'matched', 'disputed', 'settled', 'withdrawn'] as const;
export type ExtractionState = (typeof EXTRACTION_STATES)[number];

export const createAssignmentSchema = z.object({
  referenceId: idParam,
  coder1Id: idParam,
  coder2Id: idParam,
}).refine((v) => v.coder1Id !== v.coder2Id, { path: ['coder2Id'], message: 'choose two different coders' });

export const resolveDiscrepancySchema = z
  .object({
    resolution: z.enum(['a', 'b', 'value']),
    value: z.unknown().optional(),
    rationale: z.string().trim().min(3, 'say why (at least 3 characters)').max(2000),
  })
  .refine((v) => v.resolution !== 'value' || v.value !== undefined, { path: ['value'], message: 'enter the value to keep' });

export const settleSchema = z.object({ rationale: z.string().trim().max(2000).default('') });
export const reasonSchema = z.object({ reason: z.string().trim().min(3, 'give a reason (at least 3 characters)').max(2000) });

export const effectsQuerySchema = z.object({
  state: z.enum(['settled']).default('settled'),
  manipulation: z.union([termSchema, z.array(termSchema).max(50)]).optional(),
  outcome: z.enum(OUTCOME_KINDS).optional(),
  metric: z.enum(METRICS).optional(),
  population: z.enum(POPULATIONS).optional(),
  modality: z.enum(MODALITIES).optional(),
  task: z.enum(TASKS).optional(),
  design: z.enum(DESIGNS).optional(),
  referenceId: idParam.optional(),
  yearFrom: z.coerce.number().int().min(1800).max(2200).optional(),
  yearTo: z.coerce.number().int().min(1800).max(2200).optional(),
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sort: z.enum(['id', 'year', 'effect', 'variance', 'reference', 'manipulation', 'outcome']).default('id'),
  order: z.enum(['asc', 'desc']).default('asc'),
});
export type EffectsQuery = z.infer<typeof effectsQuerySchema>;

/** A curator's edit of one settled effect (recomputed on the server). */
export const editSettledEffectSchema = z.object({
  version: z.coerce.number().int().min(1),
  reason: z.string().trim().min(3, 'give a reason (at least 3 characters)').max(2000),
  effect: effectDraftSchema,
});

export const manipulationCreateSchema = z.object({
  term: termSchema,
  label: z.string().trim().min(2, 'at least 2 characters').max(80),
  description: z.string().trim().max(1000).default(''),
});
export const manipulationUpdateSchema = z.object({
  version: z.coerce.number().int().min(1),
  label: z.string().trim().min(2, 'at least 2 characters').max(80).optional(),
  description: z.string().trim().max(1000).optional(),
  retired: z.boolean().optional(),
});

/** Numbers agree when they differ by at most this (the reconciliation screen states it). */
export const TOLERANCE = { relative: 0.01, absolute: 0.001 } as const;
export const TOLERANCE_TEXT = 'Numbers agree when they differ by no more than 1% of the larger value, or by 0.001 when both are near zero; categories must match exactly.';

export function numbersAgree(a: number | null | undefined, b: number | null | undefined): boolean {
  if (a == null || b == null) return a == null && b == null;
  return Math.abs(a - b) <= Math.max(TOLERANCE.absolute, TOLERANCE.relative * Math.max(Math.abs(a), Math.abs(b)));
}

// ---- answers about coding sheets

/** What the server computes of an effect from what was reported. */
export const computedSchema = z.object({
  metric: z.enum(METRICS),
  effect: z.number(),
  variance: z.number(),
  formula: z.string(),
  assumedR: z.number().nullable(),
  n: z.number().int().nullable(),
  /** computed from a reported bound (p < …); absent in snapshots frozen before it was recorded */
  fromBound: z.boolean().optional(),
  /** rests on a mean and SD estimated from a median (Wan et al. 2014); absent in older snapshots */
  approximate: z.boolean().optional(),
  /** the sign was reversed to keep the outcome kind's convention (a lower PSE or bisection point means longer) */
  signReversed: z.boolean().optional(),
});

/** A coded effect as stored and answered (the server's computation from what was reported, when it computes). */
export const storedEffectSchema = z.object({
  id: z.number().int(),
  label: z.string(),
  outcome: z.enum(OUTCOME_KINDS).optional(),
  manipulation: z.string().optional(),
  parameter: z.enum(PARAMETERS).optional(),
  unit: z.enum(UNITS).optional(),
  form: z.enum(REPORT_FORMS).optional(),
  reported: reportedSchema,
  assumedR: z.number().optional(),
  page: z.string().optional(),
  locator: z.string().optional(),
  quote: z.string().optional(),
  version: z.number().int(),
  /** set when a curator withdrew this settled effect */
  withdrawnReason: z.string().nullable().optional(),
  derivation: derivationSchema.optional(),
  computed: computedSchema.nullable(),
});
export type StoredEffect = z.infer<typeof storedEffectSchema>;

export const storedStudySchema = z.object({
  id: z.number().int(),
  studyId: z.number().int().nullable(),
  label: z.string(),
  design: z.enum(DESIGNS).optional(),
  n1: z.number().int().optional(),
  n2: z.number().int().optional(),
  population: z.enum(POPULATIONS).optional(),
  diagnosis: z.string().optional(),
  modality: z.enum(MODALITIES).optional(),
  task: z.enum(TASKS).optional(),
  standardMs: z.number().optional(),
  effects: z.array(storedEffectSchema),
});
export type StoredStudy = z.infer<typeof storedStudySchema>;

const referenceBriefSchema = z.object({ id: z.number().int(), title: z.string(), label: z.string(), doi: z.string().nullable() });
export type ReferenceBrief = z.infer<typeof referenceBriefSchema>;

/** GET /api/extractions/:id and GET /api/records/:id */
export const extractionDetailSchema = z.object({
  extraction: z.object({
    id: z.number().int(),
    kind: z.enum(['coding', 'settled']),
    state: z.enum(EXTRACTION_STATES),
    version: z.number().int(),
    recordVersion: z.number().int().nullable(),
    assignmentId: z.number().int().nullable(),
    referenceId: z.number().int(),
    reference: referenceBriefSchema.extend({ year: z.number().int().nullable() }),
    coder: z.string().nullable(),
    updatedBy: z.string().nullable(),
    updatedAt: timestamp,
    submittedAt: timestamp.nullable(),
    settledAt: timestamp.nullable(),
    supersedesId: z.number().int().nullable(),
    supersededBy: z.number().int().nullable(),
    reopenReason: z.string().nullable(),
    notes: z.string(),
    editable: z.boolean(),
  }),
  studies: z.array(storedStudySchema),
});
export type ExtractionDetail = z.infer<typeof extractionDetailSchema>;

/** PUT /api/extractions/:id */
export const savedSheetSchema = z.object({ version: z.number().int(), updatedAt: timestamp, studies: z.array(storedStudySchema) });
export type SavedSheet = z.infer<typeof savedSheetSchema>;

/** POST /api/extractions/:id/submit: the sheet's state, and the pair's when this was the second sheet. */
export const submitResultSchema = z.object({
  state: z.enum(['submitted', 'settled', 'disputed']),
  pairState: z.enum(['coding', 'matched', 'disputed', 'settled', 'withdrawn']).nullable(),
  discrepancies: z.number().int(),
  recordId: z.number().int().optional(),
});
export type SubmitResult = z.infer<typeof submitResultSchema>;

export const myExtractionsQuerySchema = pagingSchema(['updated', 'reference', 'state'] as const, 'updated', { order: 'desc' }).extend({
  state: z.enum(EXTRACTION_STATES).optional(),
});
export type MyExtractionsQuery = z.infer<typeof myExtractionsQuerySchema>;

export const myExtractionSchema = z.object({
  id: z.number().int(),
  state: z.enum(EXTRACTION_STATES),
  version: z.number().int(),
  updatedAt: timestamp,
  assignmentId: z.number().int().nullable(),
  referenceId: z.number().int(),
  referenceLabel: z.string(),
  title: z.string(),
  effects: z.number().int(),
});
export type MyExtraction = z.infer<typeof myExtractionSchema>;
export const myExtractionPageSchema = pageSchema(myExtractionSchema);
export type MyExtractionPage = z.infer<typeof myExtractionPageSchema>;

export const claimableQuerySchema = pagingSchema(['reference', 'year'] as const, 'reference', { pageSize: 15 }).extend({
  q: z.string().trim().max(200).optional(),
});
export type ClaimableQuery = z.infer<typeof claimableQuerySchema>;

export const claimableSchema = z.object({ id: z.number().int(), title: z.string(), referenceLabel: z.string(), year: z.number().int().nullable(), doi: z.string().nullable() });
export type Claimable = z.infer<typeof claimableSchema>;
export const claimablePageSchema = pageSchema(claimableSchema);
export type ClaimablePage = z.infer<typeof claimablePageSchema>;

export const claimSchema = z.object({ referenceId: idParam });
/** POST /api/extractions: the new sheet. */
export const createdSchema = z.object({ id: z.number().int() });
export type Created = z.infer<typeof createdSchema>;
