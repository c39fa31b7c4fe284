import type { Metric, SmdFamily } from '../stats/metrics.js';

/** Outcome kinds and the metrics each may be pooled in (the brief's table). */
export const OUTCOME_KINDS = [
  'duration_distortion',
  'simultaneity_window',
  'temporal_order',
  'recalibration_shift',
  'postdiction_window',
  'positional_lag',
] as const;
export type OutcomeKind = (typeof OUTCOME_KINDS)[number];

export interface OutcomeInfo {
  label: string;
  typicalReport: string;
  metrics: readonly Metric[];
}

export const OUTCOMES: Record<OutcomeKind, OutcomeInfo> = {
  duration_distortion: {
    label: 'Duration distortion',
    typicalReport: 'perceived/physical duration, % change, PSE shift (ms) in bisection, counts of “longer” judgements',
    // a PSE shift in ms is a mean difference; counts of “longer”/“shorter” judgements per group a log odds ratio
    metrics: ['log_ratio', 'mean_diff', 'g_s', 'g_av', 'g_rm', 'g_z', 'log_odds_ratio'],
  },
  simultaneity_window: {
    label: 'Simultaneity window',
    typicalReport: 'window width (ms) from simultaneity judgements',
    metrics: ['raw_mean', 'mean_diff'],
  },
  temporal_order: {
    label: 'Temporal order',
    typicalReport: 'PSS and JND (ms) from temporal order judgements',
    // a ratio of JNDs is a log ratio of means; counts of “first”/“second” judgements a log odds ratio
    metrics: ['mean_diff', 'log_ratio', 'g_s', 'g_av', 'g_rm', 'g_z', 'log_odds_ratio'],
  },
  recalibration_shift: {
    label: 'Recalibration shift',
    typicalReport: 'PSS shift after delay adaptation (ms)',
    metrics: ['mean_diff', 'g_s', 'g_av', 'g_rm', 'g_z'],
  },
  postdiction_window: {
    label: 'Postdiction window',
    typicalReport: 'how much later information alters an earlier percept (ms)',
    metrics: ['raw_mean'],
  },
  positional_lag: {
    label: 'Positional lag',
    typicalReport: 'perceived offset of a moving object (deg or ms)',
    metrics: ['mean_diff', 'g_s', 'g_av', 'g_rm', 'g_z'],
  },
};

export const METRIC_LABELS: Record<Metric, string> = {
  g_s: "Hedges' g_s (independent groups)",
  g_av: "Hedges' g_av (within subject, average SD)",
  g_rm: "Hedges' g_rm (within subject, raw-score SD)",
  g_z: "Hedges' g_z (within subject, SD of differences)",
  log_ratio: 'log ratio of means',
  mean_diff: 'mean difference',
  raw_mean: 'raw mean',
  fisher_z: "Fisher's z",
  log_odds_ratio: 'log odds ratio',
};

/** What a synthesis pooling a whole SMD family calls its metric. */
export const SMD_FAMILY_LABELS: Record<SmdFamily, string> = {
  raw_score: "raw-score standardized mean difference (Hedges' g_s, g_av and g_rm together)",
};

export function metricAllowed(outcome: OutcomeKind, metric: Metric): boolean {
  return OUTCOMES[outcome].metrics.includes(metric);
}
