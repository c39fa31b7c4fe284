import { z } from 'zod';
import { METHODS } from '../stats/types.js';
import { METRICS } from '../stats/metrics.js';

const term = z.string().trim().min(1).max(120);
const year = z.coerce.number().int().min(1800).max(2200);

/** Which settled effects enter a synthesis. Every field narrows; absent means "any". */
export const synthesisFiltersSchema = z
  .object({
    manipulation: z.union([term, z.array(term).min(1).max(50)]).optional(),
    outcome: term.optional(),
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
    message: 'yearFrom must not be after yearTo',
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

export const dependenceSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('aggregate'), r: z.number().min(0).max(1).default(0.5) }).strict(),
  z.object({ mode: z.literal('one'), rule: z.enum(ONE_PER_STUDY_RULES).default('largest_n') }).strict(),
]);
export type Dependence = z.infer<typeof dependenceSchema>;

export const SUBGROUP_VARIABLES = ['population', 'modality', 'task', 'design', 'outcome', 'manipulation'] as const;
export type SubgroupVariable = (typeof SUBGROUP_VARIABLES)[number];
export const MODERATORS = ['standardMs', 'year'] as const;
export type Moderator = (typeof MODERATORS)[number];
export const MODERATOR_LABELS: Record<Moderator, string> = { standardMs: 'Standard duration (ms)', year: 'Publication year' };

export const synthesisRequestSchema = z
  .object({
    filters: synthesisFiltersSchema.default({}),
    method: z.enum(METHODS).default('DL'),
    hksj: z.boolean().default(false),
    level: z.number().gt(0.5).lt(1).default(0.95),
    dependence: dependenceSchema.default({ mode: 'aggregate', r: 0.5 }),
    subgroup: z.enum(SUBGROUP_VARIABLES).optional(),
    moderator: z.enum(MODERATORS).optional(),
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

export const snapshotListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
  sort: z.enum(['created_at', 'k', 'estimate', 'title']).default('created_at'),
  order: z.enum(['asc', 'desc']).default('desc'),
  mine: z.enum(['true', 'false']).optional(),
});

export const snapshotCreateSchema = synthesisRequestSchema.extend({ title: z.string().trim().min(1).max(200).optional() });

export const atlasSlugSchema = z.object({ slug: z.string().trim().min(1).max(120) });
