import { computeEffect } from '../stats/compute-effect.js';
import { StatsInputError } from '../stats/errors.js';
import { formulas, type FormulaInfo } from '../stats/formulas.js';
import type { EffectMeasure } from '../stats/effect-fields.js';
import type { Metric } from '../stats/metrics.js';

/** How the paper reported a result: the engine's measures plus a ratio or percent change with its CI or SE and 2×2 counts. */
export const REPORT_FORMS = [
  'smd',
  'smd_paired',
  'log_ratio',
  'log_ratio_paired',
  'ratio_ci',
  'percent_change',
  'mean_diff',
  'raw_mean',
  'fisher_z',
  'counts_2x2',
  'counts_smd',
] as const;
export type ReportForm = (typeof REPORT_FORMS)[number];

/** The engine measure (shared/stats computeEffect) each form is computed with. */
const MEASURE_OF_FORM: Record<ReportForm, EffectMeasure> = {
  smd: 'smd',
  smd_paired: 'smd_paired',
  log_ratio: 'log_ratio',
  log_ratio_paired: 'log_ratio_paired',
  ratio_ci: 'log_ratio',
  percent_change: 'log_ratio',
  mean_diff: 'mean_diff',
  raw_mean: 'raw_mean',
  fisher_z: 'fisher_z',
  counts_2x2: 'log_odds_ratio',
  counts_smd: 'smd',
};

export const REPORT_FORM_LABELS: Record<ReportForm, string> = {
  smd: "Two groups → Hedges' g_s (means & SDs, t, F or p)",
  smd_paired: "Within subject → Hedges' g_rm, g_av or g_z (SD of differences, condition SDs, or paired t)",
  log_ratio: 'Two groups → log ratio of means',
  log_ratio_paired: 'Within subject → log ratio of means',
  ratio_ci: 'Ratio with its confidence interval → log ratio of means',
  percent_change: 'Percent change with its CI or SE → log ratio of means',
  mean_diff: 'Mean difference in ms (SDs, SD of differences, t or CI)',
  raw_mean: 'Single raw mean in ms (mean, SD, n)',
  fisher_z: "Correlation → Fisher's z",
  counts_2x2: '2×2 counts (e.g. “longer”/“shorter” judgements per group) → log odds ratio',
  counts_smd: "2×2 counts → Hedges' g_s through the log odds ratio (Chinn 2000)",
};

/**
 * The metrics each form can give; which one is decided by what was reported (computeEffect reports it): within
 * subject, the SD of differences or a paired t with r give g_rm, condition SDs with r give g_av, a paired t (or p)
 * without r gives g_z.
 */
export const METRICS_OF_FORM: Record<ReportForm, readonly Metric[]> = {
  smd: ['g_s'],
  smd_paired: ['g_rm', 'g_av', 'g_z'],
  log_ratio: ['log_ratio'],
  log_ratio_paired: ['log_ratio'],
  ratio_ci: ['log_ratio'],
  percent_change: ['log_ratio'],
  mean_diff: ['mean_diff'],
  raw_mean: ['raw_mean'],
  fisher_z: ['fisher_z'],
  counts_2x2: ['log_odds_ratio'],
  counts_smd: ['g_s'],
};

/** What the sheet says beside a g_z: how to get a raw-score g instead. */
export const GZ_ADVICE = 'g_z is standardized by the SD of the differences and is never pooled with g_s, g_av or g_rm. Enter the correlation r between the conditions (reported, or assumed and stated) to get a raw-score g_rm.';

/** Every reported value the sheet can hold; which ones a form uses is in REPORT_FIELDS. */
export const REPORTED_KEYS = [
  'mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2', 't', 'F', 'p', 'direction',
  'mean_diff', 'sd_diff', 'n', 'r', 'ci_lower', 'ci_upper', 'level', 'df', 'mean', 'sd', 'percent', 'se',
  // a bound (p < .001 kept as 0.001: the effect is flagged as computed from a bound)
  'p_less_than',
  // SEs instead of SDs; medians with quartiles and/or range (Wan et al. 2014: the effect is flagged approximate)
  'se1', 'se2', 'median1', 'lower_quartile1', 'upper_quartile1', 'min1', 'max1', 'median2', 'lower_quartile2', 'upper_quartile2', 'min2', 'max2',
  'median', 'lower_quartile', 'upper_quartile', 'min', 'max',
  // a ratio with its CI; 2×2 counts (one response and the other, per group)
  'ratio', 'events1', 'nonevents1', 'events2', 'nonevents2',
] as const;
export type ReportedKey = (typeof REPORTED_KEYS)[number];
export type Reported = Partial<Record<ReportedKey, number>>;

/** The fields each form offers, in entry order (alternatives are chosen by which are filled). */
const MEDIANS = ['median1', 'lower_quartile1', 'upper_quartile1', 'min1', 'max1', 'median2', 'lower_quartile2', 'upper_quartile2', 'min2', 'max2'] as const;

export const REPORT_FIELDS: Record<ReportForm, readonly ReportedKey[]> = {
  smd: ['mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2', 't', 'F', 'p', 'p_less_than', 'direction', 'se1', 'se2', ...MEDIANS],
  smd_paired: ['mean_diff', 'sd_diff', 'mean1', 'sd1', 'mean2', 'sd2', 't', 'n', 'r', 'p', 'p_less_than', 'direction'],
  log_ratio: ['mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2', 'se1', 'se2', ...MEDIANS],
  log_ratio_paired: ['mean1', 'sd1', 'mean2', 'sd2', 'n', 'r'],
  ratio_ci: ['ratio', 'ci_lower', 'ci_upper', 'level', 'df', 'n'],
  percent_change: ['percent', 'ci_lower', 'ci_upper', 'level', 'df', 'se', 'n'],
  mean_diff: ['mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2', 'mean_diff', 'sd_diff', 'n', 't', 'ci_lower', 'ci_upper', 'level', 'df', 'se1', 'se2', ...MEDIANS],
  raw_mean: ['mean', 'sd', 'n', 'se', 'median', 'lower_quartile', 'upper_quartile', 'min', 'max'],
  fisher_z: ['r', 'n'],
  counts_2x2: ['events1', 'nonevents1', 'events2', 'nonevents2'],
  counts_smd: ['events1', 'nonevents1', 'events2', 'nonevents2'],
};

const COUNT_KEYS = ['events1', 'nonevents1', 'events2', 'nonevents2'] as const;

/** The complete sets of the forms whose engine measure takes more (the message then names only this form's fields). */
const FORM_NEEDS: Partial<Record<ReportForm, readonly (readonly ReportedKey[])[]>> = {
  ratio_ci: [['ratio', 'ci_lower', 'ci_upper']],
  percent_change: [['percent', 'ci_lower', 'ci_upper'], ['percent', 'se']],
  counts_2x2: [COUNT_KEYS],
  counts_smd: [COUNT_KEYS],
};

/** Forms whose within-subject variance needs the correlation between conditions. */
const NEEDS_R: Partial<Record<ReportForm, (r: Reported) => boolean>> = {
  smd_paired: (r) => r.t === undefined || r.sd_diff !== undefined || r.sd1 !== undefined,
  log_ratio_paired: () => true,
};

/** The correlation assumed when a within-subject paper does not report one (a stated, editable assumption). */
export const DEFAULT_ASSUMED_R = 0.5;

export interface ComputedEffect {
  metric: Metric;
  effect: number;
  variance: number;
  formula: string;
  formulaInfo: FormulaInfo | null;
  /** the correlation that was assumed (not reported), or null */
  assumedR: number | null;
  /** total participants the effect rests on, when the reported values say */
  n: number | null;
  /** computed from a reported bound (p < …): its size is a lower limit */
  fromBound: boolean;
  /** rests on a mean and SD estimated from a median with quartiles or range (Wan et al. 2014) */
  approximate: boolean;
  /** reversed to keep the outcome kind's sign convention (extraction/orientation.ts), with the reason */
  signReversed?: boolean;
  signReason?: string;
}

/**
 * Computes the effect size and its variance from what the paper reported, with the engine in shared/stats.
 * A missing r for a within-subject form is replaced by `assumedR` (default DEFAULT_ASSUMED_R) and returned as such.
 * Throws StatsInputError (with the field name) when the values cannot give an effect.
 */
export function computeReported(form: ReportForm, reported: Reported, assumedR?: number | null): ComputedEffect {
  const values: Reported = {};
  for (const key of REPORT_FIELDS[form]) if (reported[key] !== undefined && reported[key] !== null) values[key] = reported[key];
  let usedAssumed: number | null = null;
  if (NEEDS_R[form]?.(values) && values.r === undefined) {
    const r = assumedR ?? DEFAULT_ASSUMED_R;
    values.r = r;
    usedAssumed = r;
  }
  // a ratio or percent change whose spread (SE or CI) comes from one participant
  if ((form === 'ratio_ci' || form === 'percent_change') && values.n === 1 && (values.se !== undefined || values.ci_lower !== undefined || values.ci_upper !== undefined))
    throw new StatsInputError('n = 1 cannot come with an SE or a confidence interval; a spread needs at least 2 observations', 'n');
  const needs = FORM_NEEDS[form];
  if (needs && !needs.some((set) => set.every((k) => values[k] !== undefined))) {
    throw new StatsInputError(`this form needs ${needs.map((set) => set.join(', ')).join('; or ')}`);
  }
  const out = computeEffect({ measure: MEASURE_OF_FORM[form], ...values });
  const n =
    form === 'counts_2x2' || form === 'counts_smd'
      ? COUNT_KEYS.reduce((sum, k) => sum + values[k]!, 0)
      : values.n1 !== undefined && values.n2 !== undefined
        ? values.n1 + values.n2
        : values.n !== undefined
          ? values.n
          : null;
  return {
    metric: out.metric,
    effect: out.effect,
    variance: out.variance,
    formula: out.formula,
    formulaInfo: formulas[out.formula] ?? null,
    assumedR: usedAssumed,
    n,
    fromBound: out.from_bound === true,
    approximate: out.approximate === true,
  };
}

export interface ComputeAttempt {
  ok: boolean;
  result?: ComputedEffect;
  error?: string;
  field?: string;
}

/** computeReported without throwing, for the live sheet. */
export function tryComputeReported(form: ReportForm, reported: Reported, assumedR?: number | null): ComputeAttempt {
  try {
    return { ok: true, result: computeReported(form, reported, assumedR) };
  } catch (e) {
    if (e instanceof StatsInputError) return { ok: false, error: e.message, field: e.field };
    throw e;
  }
}
