import { z } from 'zod';
import { PSYCHOMETRIC_MODELS } from '../psychophysics/psychometric.js';
import { CONTRAST_MEASURES } from '../trials/contrast.js';
import { TRIAL_PARAMETERS, TRIAL_TASKS } from '../trials/fits.js';
import { MODALITIES } from '../vocabulary/modalities.js';
import { idParam, timestamp } from './common.js';

/** The form fields sent with an uploaded CSV of trials or counts. */
export const trialUploadSchema = z
  .object({
    label: z.string().trim().min(1, 'name the data set (e.g. Experiment 1, order task)').max(120, 'at most 120 characters'),
    task: z.enum(TRIAL_TASKS, 'choose the task the trials come from'),
    model: z.enum(PSYCHOMETRIC_MODELS, 'choose cumulative Gaussian or logistic').default('cumulative_gaussian'),
    modality: z.enum(MODALITIES, 'choose a modality'),
  });
export type TrialUpload = z.infer<typeof trialUploadSchema>;

export const trialSetParamsSchema = z.object({ setId: idParam });

/** Starting the fits: how many bootstrap resamples per participant × condition. */
export const startFitsSchema = z.object({
  resamples: z.coerce.number().int('a whole number').min(100, 'at least 100 resamples').max(2000, 'at most 2,000 resamples').default(1000),
});

export const contrastQuerySchema = z
  .object({
    parameter: z.enum(TRIAL_PARAMETERS, 'choose a parameter'),
    conditionA: z.string().trim().min(1, 'choose condition A').max(60),
    conditionB: z.string().trim().min(1, 'choose condition B').max(60),
    measure: z.enum(CONTRAST_MEASURES).default('mean_diff'),
  })
  .refine((v) => v.conditionA !== v.conditionB, { path: ['conditionB'], message: 'choose two different conditions' });

/** How a coded effect was derived from trial data (kept with the effect, refreshed from the fits on every save). */
export const derivationSchema = z.object({
  source: z.literal('trial_data'),
  trialSetId: idParam,
  parameter: z.enum(TRIAL_PARAMETERS),
  conditionA: z.string().min(1).max(60),
  conditionB: z.string().min(1).max(60),
  measure: z.enum(CONTRAST_MEASURES),
  /** filled by the server from the fits */
  setLabel: z.string().optional(),
  fittedAt: z.string().optional(),
  n: z.number().int().optional(),
  mean1: z.number().optional(),
  sd1: z.number().optional(),
  mean2: z.number().optional(),
  sd2: z.number().optional(),
  r: z.number().nullable().optional(),
  excluded: z.number().int().optional(),
});
export type Derivation = z.infer<typeof derivationSchema>;

const intervalSchema = z.object({ lower: z.number().nullable(), upper: z.number().nullable(), sd: z.number().nullable(), usable: z.number().int() });
const flagSchema = z.object({ code: z.enum(['not_converged', 'outside_range', 'no_width', 'narrow_window', 'wide_window', 'audiovisual_band']), message: z.string(), commonPractice: z.boolean() });

const nnum = z.number().nullable();
export const psychometricFitSchema = z.object({
  model: z.enum(PSYCHOMETRIC_MODELS), pse: nnum, se_pse: nnum, spread: nnum, se_spread: nnum, jnd: nnum, lapse: nnum,
  deviance: z.number(), df: z.number(), loglik: z.number(), converged: z.boolean(), iterations: z.number(),
});
export const simultaneityFitSchema = z.object({
  centre: nnum, se_centre: nnum, width: nnum, se_width: nnum, amplitude: nnum, sigma: nnum, deviance: z.number(), df: z.number(), loglik: z.number(), converged: z.boolean(),
});

export const cellFitSchema = z.object({
  participant: z.string(),
  condition: z.string(),
  kind: z.enum(['psychometric', 'simultaneity']),
  x: z.array(z.number()),
  n: z.array(z.number()),
  k: z.array(z.number()),
  fit: z.union([psychometricFitSchema, simultaneityFitSchema]),
  ci: z.record(z.string(), intervalSchema.nullable()),
  resamples: z.number().int(),
  failed: z.number().int(),
  flags: z.array(flagSchema),
});


export const FIT_STATES = ['none', 'queued', 'running', 'done', 'failed'] as const;

/** A data set of trials as listed on its sheet. */
export const trialSetSchema = z.object({
  id: z.number().int(),
  extractionId: z.number().int(),
  label: z.string(),
  task: z.enum(TRIAL_TASKS),
  model: z.enum(PSYCHOMETRIC_MODELS),
  modality: z.enum(MODALITIES),
  format: z.enum(['trials', 'counts']),
  fileName: z.string(),
  rows: z.number().int(),
  trials: z.number().int(),
  participants: z.number().int(),
  conditions: z.array(z.string()),
  levelMin: z.number(),
  levelMax: z.number(),
  uploadedBy: z.string().nullable(),
  createdAt: timestamp,
  fit: z.object({
    state: z.enum(FIT_STATES),
    done: z.number().int(),
    total: z.number().int(),
    resamples: z.number().int().nullable(),
    error: z.string().nullable(),
    fittedAt: timestamp.nullable(),
  }),
  editable: z.boolean(),
});
export type TrialSet = z.infer<typeof trialSetSchema>;

export const trialSetListSchema = z.object({ items: z.array(trialSetSchema) });
export type TrialSetList = z.infer<typeof trialSetListSchema>;

/** GET /api/trial-sets/:setId: the set, its fits (when done) and the flags counted. */
export const trialSetDetailSchema = z.object({
  set: trialSetSchema,
  fits: z.array(cellFitSchema),
  flagged: z.object({ notConverged: z.number().int(), outsideRange: z.number().int(), plausibility: z.number().int() }),
});
export type TrialSetDetail = z.infer<typeof trialSetDetailSchema>;
export type CellFitAnswer = z.infer<typeof cellFitSchema>;

/** GET /api/trial-sets/:setId/contrast: the effect the fits give for two conditions. */
export const contrastSchema = z.object({
  parameter: z.enum(TRIAL_PARAMETERS),
  conditionA: z.string(),
  conditionB: z.string(),
  measure: z.enum(CONTRAST_MEASURES),
  summary: z.object({
    n: z.number().int(), mean1: z.number(), sd1: z.number(), mean2: z.number(), sd2: z.number(),
    mean_diff: z.number(), sd_diff: z.number(), r: z.number().nullable(),
  }),
  excluded: z.array(z.object({ participant: z.string(), reason: z.string() })),
  form: z.enum(['mean_diff', 'log_ratio_paired']),
  reported: z.record(z.string(), z.number()),
  effect: z.object({ metric: z.string(), effect: z.number(), variance: z.number(), formula: z.string() }),
  derivation: derivationSchema,
});
export type ContrastAnswer = z.infer<typeof contrastSchema>;

/** POST /api/trial-sets/:setId/fits */
export const fitStartedSchema = z.object({ state: z.enum(FIT_STATES), total: z.number().int(), jobId: z.string().nullable() });
