import type { Metric } from '../stats/metrics.js';

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
    typicalReport: 'perceived/physical duration, % change, PSE shift (ms) in bisection',
    metrics: ['log_ratio', 'hedges_g'],
  },
  simultaneity_window: {
    label: 'Simultaneity window',
    typicalReport: 'window width (ms) from simultaneity judgements',
    metrics: ['raw_mean', 'mean_diff'],
  },
  temporal_order: {
    label: 'Temporal order',
    typicalReport: 'PSS and JND (ms) from temporal order judgements',
    metrics: ['mean_diff', 'hedges_g'],
  },
  recalibration_shift: {
    label: 'Recalibration shift',
    typicalReport: 'PSS shift after delay adaptation (ms)',
    metrics: ['mean_diff', 'hedges_g'],
  },
  postdiction_window: {
    label: 'Postdiction window',
    typicalReport: 'how much later information alters an earlier percept (ms)',
    metrics: ['raw_mean'],
  },
  positional_lag: {
    label: 'Positional lag',
    typicalReport: 'perceived offset of a moving object (deg or ms)',
    metrics: ['mean_diff', 'hedges_g'],
  },
};

export const METRIC_LABELS: Record<Metric, string> = {
  hedges_g: "Hedges' g",
  log_ratio: 'log ratio of means',
  mean_diff: 'mean difference',
  raw_mean: 'raw mean',
  fisher_z: "Fisher's z",
};

export function metricAllowed(outcome: OutcomeKind, metric: Metric): boolean {
  return OUTCOMES[outcome].metrics.includes(metric);
}
