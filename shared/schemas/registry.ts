// The settled registry as the API answers it: settled effects and the manipulation vocabulary.
import { z } from 'zod';
import { METRICS } from '../stats/metrics.js';
import { REPORT_FORMS } from '../extraction/compute.js';
import { pageSchema, pagingSchema, timestamp } from './common.js';
import { computedSchema, reportedSchema } from './extraction.js';

/** One settled effect with its study and reference (the effects API, snapshots' frozen rows). */
export const settledEffectRowSchema = z.object({
  id: z.number().int(),
  referenceId: z.number().int(),
  /** stable across reopened versions of the settled record: group dependent effects by it */
  studyId: z.number().int(),
  studyLabel: z.string(),
  /** first author + year, e.g. "Okafor 2019" */
  referenceLabel: z.string(),
  year: z.number().int().nullable(),
  outcome: z.string(),
  /** what was measured and its unit; absent in snapshots frozen before both were recorded */
  parameter: z.string().nullable().optional(),
  unit: z.string().nullable().optional(),
  manipulation: z.string(),
  manipulationLabel: z.string(),
  ...computedSchema.shape,
  design: z.string().nullable(),
  population: z.string().nullable(),
  diagnosis: z.string().nullable(),
  modality: z.string().nullable(),
  task: z.string().nullable(),
  standardMs: z.number().nullable(),
  label: z.string(),
  doi: z.string().nullable(),
  title: z.string(),
  recordId: z.number().int(),
  recordVersion: z.number().int(),
});
export type SettledEffectRow = z.infer<typeof settledEffectRowSchema>;

/** GET /api/effects: a page of settled effects and the registry version it was read at. */
export const settledEffectPageSchema = pageSchema(settledEffectRowSchema).extend({ registryVersion: z.number().int() });
export type SettledEffectPage = z.infer<typeof settledEffectPageSchema>;

/** GET /api/effects/:id: the effect with what was reported and where. */
export const settledEffectDetailSchema = z.object({
  effect: settledEffectRowSchema.extend({
    form: z.enum(REPORT_FORMS).nullable(),
    reported: reportedSchema,
    page: z.string().nullable(),
    locator: z.string().nullable(),
    quote: z.string().nullable(),
    version: z.number().int(),
  }),
});
export type SettledEffectDetail = z.infer<typeof settledEffectDetailSchema>;

/** PATCH /api/effects/:id: the recomputed effect. */
export const editedEffectSchema = z.object({
  id: z.number().int(),
  version: z.number().int(),
  effect: z.number(),
  variance: z.number(),
  metric: z.enum(METRICS),
  formula: z.string(),
  registryVersion: z.number().int(),
});
export type EditedEffect = z.infer<typeof editedEffectSchema>;
/** POST /api/effects/:id/withdraw */
export const withdrawnEffectSchema = z.object({ id: z.number().int(), withdrawn: z.literal(true), registryVersion: z.number().int() });
export type WithdrawnEffect = z.infer<typeof withdrawnEffectSchema>;

// ---- the manipulation vocabulary

export const manipulationListQuerySchema = pagingSchema(['term', 'label', 'effects'] as const, 'label', { pageSize: 100 }).extend({
  includeRetired: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
});
export type ManipulationListQuery = z.infer<typeof manipulationListQuerySchema>;

export const manipulationSchema = z.object({
  id: z.number().int(),
  term: z.string(),
  label: z.string(),
  description: z.string(),
  retired: z.boolean(),
  retiredAt: timestamp.nullable(),
  version: z.number().int(),
  settledEffects: z.number().int(),
});
export type Manipulation = z.infer<typeof manipulationSchema>;
export const manipulationPageSchema = pageSchema(manipulationSchema);
export type ManipulationPage = z.infer<typeof manipulationPageSchema>;
/** POST /api/manipulations and PATCH /api/manipulations/:term */
export const manipulationResultSchema = z.object({ manipulation: manipulationSchema });
export type ManipulationResult = z.infer<typeof manipulationResultSchema>;
