import { EFFECT_METRICS, type EffectMetric } from './effect-metrics.js';

/**
 * The effect-size metrics the registry stores and pools: exactly what computeEffect reports (effect-metrics.ts).
 * Standardized mean differences are named by their standardizer (Lakens 2013; Morris & DeShon 2002):
 * - g_s: independent groups, pooled SD; g_av: within subject, average of the condition SDs;
 *   g_rm: within subject, raw-score SD from the SD of differences and r; g_z: within subject, SD of differences
 * - log_ratio: log ratio of means (Hedges, Gurevitch & Curtis 1999; Lajeunesse 2011)
 * - mean_diff, raw_mean: in the outcome's own unit; fisher_z: Fisher's z of a correlation; log_odds_ratio
 * Effects of different metrics are never pooled together, except the raw-score family below when a request asks.
 */
export const METRICS = EFFECT_METRICS;
export type Metric = EffectMetric;

/** The raw-score standardized mean differences: comparable, and pooled together only on request (smdFamily). */
export const RAW_SCORE_SMDS = ['g_s', 'g_av', 'g_rm'] as const satisfies readonly Metric[];
/** The families of standardized mean differences a synthesis may pool as one metric. */
export const SMD_FAMILIES = ['raw_score'] as const;
export type SmdFamily = (typeof SMD_FAMILIES)[number];
export const SMD_FAMILY_METRICS: Record<SmdFamily, readonly Metric[]> = { raw_score: RAW_SCORE_SMDS };

/** The key every standardized mean difference had before the standardizer was recorded (frozen snapshots keep it). */
export const LEGACY_SMD_KEY = 'hedges_g';

export const isRawScoreSmd = (m: string): boolean => (RAW_SCORE_SMDS as readonly string[]).includes(m);
