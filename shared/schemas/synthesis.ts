import { z } from 'zod';
import { METHODS } from '../stats/types.js';
import { METRICS, SMD_FAMILIES } from '../stats/metrics.js';
import { PARAMETERS, UNITS } from '../vocabulary/parameters.js';
import type { PoolResult } from '../stats/types.js';
import type { PrismaCounts } from '../synthesis/methods.js';
import type { Caution, PlotFigure, SynthesisOutput } from '../synthesis/types.js';
import type { SynthesisFlow } from '../synthesis/flow.js';
import { pageSchema, pagingSchema, timestamp } from './common.js';
import { settledEffectRowSchema } from './registry.js';

const term = z.string().trim().min(1).max(120);
const year = z.coerce.number().int().min(1800).max(2200);

/** Which settled effects enter a synthesis. Every field narrows; absent means "any". */
export const synthesisFiltersSchema = z
  .object({
    manipulation: z.union([term, z.array(term).min(1).max(50)]).optional(),
    outcome: term.optional(),
    parameter: z.enum(PARAMETERS).optional(),
    unit: z.enum(UNITS).optional(),
    /** leave out effects computed from a reported bound (p < …) */
    excludeBound: z.boolean().optional(),
    /** leave out effects whose mean and SD were estimated from a median (approximate) */
    excludeApproximate: z.boolean().optional(),
    metric: z.enum(METRICS).optional(),
    population: term.optional(),
    modality: term.optional(),
    task: term.optional(),
    design: term.optional(),
    yearFrom: year.optional(),
    yearTo: year.optional(),
  })
  .strict()
  .refine((f) => f.yearFrom === undefined || f.yearTo === undefined || f.yearFrom <= f.yearTo, {
    message: 'the from-year must not be after the to-year',
    path: ['yearTo'],
  });
export type SynthesisFilters = z.infer<typeof synthesisFiltersSchema>;

/** How several effects of one study become one unit, so no study counts twice. */
export const ONE_PER_STUDY_RULES = ['largest_n', 'smallest_variance', 'first_coded'] as const;
export type OnePerStudyRule = (typeof ONE_PER_STUDY_RULES)[number];
export const ONE_PER_STUDY_LABELS: Record<OnePerStudyRule, string> = {
  largest_n: 'the effect with the largest sample (then the smallest variance)',
  smallest_variance: 'the effect with the smallest variance',
  first_coded: 'the first effect coded for the study',
};

/** The correlations of the aggregate mode's sensitivity table. */
export const SENSITIVITY_RS = [0, 0.2, 0.4, 0.6, 0.8, 0.9] as const;

export const dependenceSchema = z.discriminatedUnion('mode', [
  z
    .object({
      mode: z.literal('aggregate'),
      r: z.number().min(0).max(1).default(0.5),
      /** metafor's inverse-variance composite (aggregate.escalc, weighted = TRUE) instead of the plain mean */
      weighted: z.boolean().optional(),
    })
    .strict()
    .refine((d) => !d.weighted || d.r < 1, { message: 'the inverse-variance composite needs r below 1', path: ['r'] }),
  z.object({ mode: z.literal('one'), rule: z.enum(ONE_PER_STUDY_RULES).default('largest_n') }).strict(),
  /** the three-level model (effects within papers), with the CR2 robust variance when robust */
  z.object({ mode: z.literal('multilevel'), robust: z.boolean().default(true) }).strict(),
]);
export type Dependence = z.infer<typeof dependenceSchema>;

export const SUBGROUP_VARIABLES = ['population', 'modality', 'task', 'design', 'outcome', 'manipulation'] as const;
export type SubgroupVariable = (typeof SUBGROUP_VARIABLES)[number];
export const MODERATORS = ['standardMs', 'year'] as const;
export type Moderator = (typeof MODERATORS)[number];
export const MODERATOR_LABELS: Record<Moderator, string> = { standardMs: 'Standard duration (ms)', year: 'Publication year' };
/** Moderators of the several-moderator meta-regression: numbers as they are, categories dummy-coded (reference: the first in code order). */
export const REGRESSION_MODERATORS = ['standardMs', 'year', 'design', 'modality', 'task', 'population'] as const;
export type RegressionModerator = (typeof REGRESSION_MODERATORS)[number];
export const CONTINUOUS_MODERATORS: readonly RegressionModerator[] = ['standardMs', 'year'];
/** How subgroups get their between-study variance: one τ² per subgroup, or one τ² shared by all (the mixed-effects model with the factor). */
export const SUBGROUP_TAU2_MODELS = ['separate', 'pooled'] as const;
export type SubgroupTau2Model = (typeof SUBGROUP_TAU2_MODELS)[number];

/** A synthesis's confidence level, from 50% to 99.9%. */
const CONFIDENCE_LEVEL_MESSAGE = 'the confidence level must be between 50% and 99.9%';

export const synthesisRequestSchema = z
  .object({
    filters: synthesisFiltersSchema.default({}),
    method: z.enum(METHODS).default('DL'),
    hksj: z.boolean().default(false),
    level: z.number({ error: CONFIDENCE_LEVEL_MESSAGE }).min(0.5, CONFIDENCE_LEVEL_MESSAGE).max(0.999, CONFIDENCE_LEVEL_MESSAGE).default(0.95),
    dependence: dependenceSchema.default({ mode: 'aggregate', r: 0.5 }),
    subgroup: z.enum(SUBGROUP_VARIABLES).optional(),
    moderator: z.enum(MODERATORS).optional(),
    /** a meta-regression on several moderators at once (Knapp–Hartung when hksj) */
    moderators: z
      .array(z.enum(REGRESSION_MODERATORS))
      .min(1)
      .max(REGRESSION_MODERATORS.length)
      .refine((m) => new Set(m).size === m.length, { message: 'each moderator may be chosen once' })
      .optional(),
    /** subgroups: a separate τ² in each (absent) or one τ² shared by all; ignored without a subgroup */
    subgroupTau2: z.enum(SUBGROUP_TAU2_MODELS).optional(),
    /** pool g_s, g_av and g_rm together as one raw-score standardized mean difference (never g_z) */
    smdFamily: z.enum(SMD_FAMILIES).optional(),
  })
  .strict();
export type SynthesisRequest = z.infer<typeof synthesisRequestSchema>;
export type SynthesisRequestInput = z.input<typeof synthesisRequestSchema>;

export const METHOD_LABELS: Record<(typeof METHODS)[number], string> = {
  DL: 'DerSimonian–Laird',
  REML: 'REML',
  PM: 'Paule–Mandel',
  FE: 'Fixed effect',
};

export const snapshotIdSchema = z.object({ id: z.string().regex(/^[a-z0-9]{10,32}$/, 'not a snapshot id') });

export const snapshotListQuerySchema = pagingSchema(['created_at', 'k', 'estimate', 'title'] as const, 'created_at', { order: 'desc' }).extend({
  mine: z.enum(['true', 'false']).optional(),
});

export const snapshotCreateSchema = synthesisRequestSchema.extend({ title: z.string().trim().min(1).max(200).optional() });

/** GET /api/syntheses/export/:file?request=<the synthesis request as JSON>: a live synthesis as a download, without freezing it. */
export const SYNTHESIS_EXPORT_FILES = ['studies.csv', 'effects.csv', 'synthesis.json', 'flow.svg'] as const;
export const synthesisExportPathSchema = z.object({ file: z.enum(SYNTHESIS_EXPORT_FILES, { message: 'choose studies.csv, effects.csv, synthesis.json or flow.svg' }) });
export const synthesisExportQuerySchema = z.object({
  request: z
    .string({ message: 'give the synthesis request as JSON in the request parameter' })
    .max(20_000)
    .transform((text, ctx) => {
      try {
        return JSON.parse(text) as unknown;
      } catch {
        ctx.addIssue({ code: 'custom', message: 'the request parameter is not valid JSON' });
        return z.NEVER;
      }
    })
    .pipe(synthesisRequestSchema),
});

export const atlasSlugSchema = z.object({ slug: z.string().trim().min(1).max(120) });

/**
 * POST /api/syntheses?rows=…: the per-study rows (`rows`, and `result.weights` beside them) in full (`all`, the
 * default), one page of them sorted on the server (`page`, with page, pageSize, sort, order), or left out (`none`).
 * `position` is the answer's own order; `se` and `variance` sort alike (the results table names it SE).
 */
export const SYNTHESIS_ROW_SORTS = ['position', 'label', 'year', 'n', 'effect', 'se', 'variance', 'weight', 'effects', 'subgroup', 'moderator'] as const;
export type SynthesisRowSort = (typeof SYNTHESIS_ROW_SORTS)[number];
export const synthesisRowsQuerySchema = pagingSchema(SYNTHESIS_ROW_SORTS, 'position', { pageSize: 50 })
  .extend({ rows: z.enum(['all', 'page', 'none'], { message: 'rows must be all, page or none' }).default('all') })
  .superRefine((q, ctx) => {
    if (q.rows !== 'page' && (q.page !== 1 || q.pageSize !== 50 || q.sort !== 'position' || q.order !== 'asc')) {
      ctx.addIssue({ code: 'custom', path: ['rows'], message: 'paging and sorting the rows apply only when the rows are asked for page by page' });
    }
  });
export type SynthesisRowsQuery = z.infer<typeof synthesisRowsQuerySchema>;

/** What the answer says about its rows when they were paged or left out (absent when they are all there). */
export const synthesisRowsPageSchema = z.object({
  rows: z.enum(['page', 'none']),
  /** per-study rows of the whole synthesis */
  total: z.number().int().min(0),
  page: z.number().int().min(1).optional(),
  pageSize: z.number().int().min(1).optional(),
  sort: z.enum(SYNTHESIS_ROW_SORTS).optional(),
  order: z.enum(['asc', 'desc']).optional(),
});
export type SynthesisRowsPage = z.infer<typeof synthesisRowsPageSchema>;
/**
 * POST /api/syntheses answers every pooled row up to SYNTHESIS_INLINE_ROWS; beyond that it carries the first
 * SYNTHESIS_ROWS_PAGE rows (and their weights) with `rowsTotal`, and the rest is read with `?rows=page`.
 */
export const SYNTHESIS_INLINE_ROWS = 1000;
export const SYNTHESIS_ROWS_PAGE = 25;

// ---- answers (the engine's own output types come from shared/synthesis and shared/stats, wrapped here)

/** POST /api/syntheses: the engine's output and the registry version it was computed on. */
export const synthesisAnswerSchema = z
  .custom<SynthesisOutput>()
  .and(z.object({ registryVersion: z.number().int(), rowsPage: synthesisRowsPageSchema.optional() }));
export type SynthesisAnswer = z.infer<typeof synthesisAnswerSchema>;

const facetSchema = z.object({ value: z.string(), count: z.number().int(), label: z.string().optional() });
export type Facet = z.infer<typeof facetSchema>;
/** GET /api/syntheses/facets: the filter values among settled effects, with counts. */
export const synthesisFacetsSchema = z.object({
  effects: z.number().int(),
  manipulations: z.array(facetSchema),
  outcomes: z.array(facetSchema),
  parameters: z.array(facetSchema),
  units: z.array(facetSchema),
  metrics: z.array(facetSchema),
  populations: z.array(facetSchema),
  modalities: z.array(facetSchema),
  tasks: z.array(facetSchema),
  designs: z.array(facetSchema),
  years: z.object({ min: z.number().int(), max: z.number().int() }).nullable(),
});
export type SynthesisFacets = z.infer<typeof synthesisFacetsSchema>;

// ---- the atlas

export const atlasCountsSchema = z.object({ effects: z.number().int(), studies: z.number().int(), references: z.number().int() });
export type AtlasCounts = z.infer<typeof atlasCountsSchema>;

/** The current pooled estimate of one (outcome kind, manipulation, metric) cell. */
export const pooledCellSchema = z.object({
  outcome: z.string(),
  outcomeLabel: z.string(),
  manipulation: z.string(),
  manipulationLabel: z.string(),
  /** what the cell's effects measured, in which unit */
  parameter: z.string().nullable(),
  unit: z.string().nullable(),
  quantityLabel: z.string().nullable(),
  metric: z.string(),
  metricLabel: z.string(),
  /** which way round a positive effect is, in words (the outcome kind's convention) */
  signConvention: z.string(),
  filters: z.record(z.string(), z.string()),
  counts: atlasCountsSchema,
  pooled: z.custom<Pick<PoolResult, 'estimate' | 'ci_lower' | 'ci_upper' | 'pi_lower' | 'pi_upper' | 'tau2' | 'I2' | 'Q_p' | 'p' | 'level' | 'method'>>(),
  cautions: z.array(z.custom<Caution>()),
  forest: z.custom<PlotFigure>().optional(),
});
export type PooledCell = z.infer<typeof pooledCellSchema>;

/** GET /api/atlas */
export const atlasLandingSchema = z.object({
  totals: atlasCountsSchema,
  /** each manipulation with its current pooled estimates (no figures) */
  manipulations: z.array(
    atlasCountsSchema.extend({ term: z.string(), label: z.string(), description: z.string(), outcomes: z.array(z.string()), estimates: z.array(pooledCellSchema) }),
  ),
  outcomes: z.array(atlasCountsSchema.extend({ kind: z.string(), label: z.string(), typicalReport: z.string(), metrics: z.array(z.string()) })),
});
export type AtlasLanding = z.infer<typeof atlasLandingSchema>;

/** GET /api/atlas/manipulations/:slug */
export const atlasManipulationSchema = z.object({
  manipulation: z.object({ term: z.string(), label: z.string(), description: z.string(), retired: z.boolean() }),
  totals: atlasCountsSchema,
  cells: z.array(pooledCellSchema),
});
export type AtlasManipulation = z.infer<typeof atlasManipulationSchema>;

/** GET /api/atlas/manipulations/:slug/pooled */
export const atlasPooledSchema = z.object({ term: z.string(), totals: atlasCountsSchema, cells: z.array(pooledCellSchema) });
export type AtlasPooled = z.infer<typeof atlasPooledSchema>;

/** GET /api/atlas/outcomes/:slug */
export const atlasOutcomeSchema = z.object({
  outcome: z.object({ kind: z.string(), label: z.string(), typicalReport: z.string(), metrics: z.array(z.string()), metricLabels: z.array(z.string()) }),
  totals: atlasCountsSchema,
  cells: z.array(pooledCellSchema),
});
export type AtlasOutcome = z.infer<typeof atlasOutcomeSchema>;

export const atlasReferencesQuerySchema = pagingSchema(['year', 'label', 'title', 'effects'] as const, 'year');
export type AtlasReferencesQuery = z.infer<typeof atlasReferencesQuerySchema>;

export const atlasReferenceSchema = z.object({
  id: z.number().int(),
  label: z.string(),
  title: z.string(),
  year: z.number().int().nullable(),
  doi: z.string().nullable(),
  studies: z.number().int(),
  effects: z.number().int(),
});
export type AtlasReference = z.infer<typeof atlasReferenceSchema>;
export const atlasReferencePageSchema = pageSchema(atlasReferenceSchema);
export type AtlasReferencePage = z.infer<typeof atlasReferencePageSchema>;

// ---- snapshots

export const snapshotSummarySchema = z.object({
  id: z.string(),
  title: z.string(),
  createdAt: timestamp,
  createdBy: z.string().nullable(),
  metric: z.string(),
  k: z.number().int(),
  estimate: z.number(),
  registryVersion: z.number().int(),
});
export type SnapshotSummary = z.infer<typeof snapshotSummarySchema>;
export const snapshotPageSchema = pageSchema(snapshotSummarySchema);
export type SnapshotPage = z.infer<typeof snapshotPageSchema>;

const count = z.number().int().min(0);
const flowReasonSchema = z.object({ reason: z.string(), label: z.string(), count });
/** The flow of records into one synthesis (PRISMA 2020), stage by stage (shared/synthesis/flow.ts builds it). */
export const synthesisFlowSchema: z.ZodType<SynthesisFlow> = z.object({
  identified: z.object({ total: count, bySource: z.record(z.string(), count) }),
  duplicatesRemoved: z.object({ total: count, importDuplicates: count, merged: count }),
  afterDuplicates: count,
  stages: z.array(
    z.object({
      stage: z.enum(['title_abstract', 'full_text', 'screening', 'coding', 'reconciliation', 'synthesis']),
      label: z.string(),
      entered: count,
      passed: count,
      excluded: count,
      excludedByReason: z.array(flowReasonSchema),
      pending: count,
      pendingLabel: z.string().nullable(),
    }),
  ),
  entering: z.object({ references: count, studies: count, effects: count }),
});
/** POST /api/syntheses/flow: the flow and the registry version it was counted on. */
export const synthesisFlowAnswerSchema = z.object({ registryVersion: z.number().int(), flow: synthesisFlowSchema });
export type SynthesisFlowAnswer = z.infer<typeof synthesisFlowAnswerSchema>;

/** POST /api/snapshots */
export const createdSnapshotSchema = z.object({
  id: z.string(),
  url: z.string(),
  apiUrl: z.string(),
  registryVersion: z.number().int(),
  /** true when the same request and title were saved before on this registry version: this is that snapshot (200, not 201) */
  existing: z.boolean(),
});
export type CreatedSnapshot = z.infer<typeof createdSnapshotSchema>;

export const snapshotReferenceSchema = z.object({ id: z.number().int(), title: z.string(), year: z.number().int().nullable(), doi: z.string().nullable(), firstAuthor: z.string().nullable() });

/** GET /api/snapshots/:id/citation (and the snapshot's `citation`): how to cite the snapshot itself. */
export const snapshotCitationSchema = z.object({
  id: z.string(),
  /** stable identifier, `chronometa:snapshot:<id>` */
  identifier: z.string(),
  url: z.string(),
  registryVersion: z.number().int(),
  /** the day it was saved, YYYY-MM-DD (UTC) */
  date: z.string().regex(/^\d{4}-\d{2}-\d{2}$/),
  text: z.string(),
  cslJson: z.record(z.string(), z.unknown()),
  bibtex: z.string(),
  ris: z.string(),
});
export type SnapshotCitation = z.infer<typeof snapshotCitationSchema>;

/** GET /api/snapshots/:id (and export.json): the frozen synthesis with its provenance. */
export const snapshotViewSchema = z.custom<SynthesisOutput>().and(
  z.object({
    id: z.string(),
    title: z.string(),
    url: z.string(),
    createdAt: timestamp,
    createdBy: z.object({ login: z.string(), name: z.string().nullable() }).nullable(),
    registryVersion: z.number().int(),
    software: z.string(),
    methods: z.string(),
    prisma: z.custom<PrismaCounts>().nullable(),
    /** the flow of records into this synthesis, stage by stage (null for snapshots saved before it was kept) */
    flow: synthesisFlowSchema.nullable(),
    citation: snapshotCitationSchema,
    effects: z.array(settledEffectRowSchema),
    references: z.array(snapshotReferenceSchema),
  }),
);
export type SnapshotView = z.infer<typeof snapshotViewSchema>;
