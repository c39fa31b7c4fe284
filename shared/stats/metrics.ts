/**
 * The effect-size metrics the registry pools. Effects of different metrics are never pooled together.
 * - hedges_g: standardized mean difference with small-sample correction (Borenstein et al. 2009, ch. 4)
 * - log_ratio: log ratio of means (Hedges, Gurevitch & Curtis 1999; Lajeunesse 2011)
 * - mean_diff: raw mean difference in the outcome's units (ms)
 * - raw_mean: a single raw mean in the outcome's units (ms)
 * - fisher_z: Fisher's z transform of a correlation
 */
export const METRICS = ['hedges_g', 'log_ratio', 'mean_diff', 'raw_mean', 'fisher_z'] as const;
export type Metric = (typeof METRICS)[number];
