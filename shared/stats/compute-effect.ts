import { StatsInputError } from './errors.js';
import { readEffectInput, type EffectField, type EffectMeasure } from './effect-fields.js';
import type { EffectSize } from './effect-checks.js';
import type { EffectMetric } from './effect-metrics.js';
import type { HedgesJ } from './hedges-correction.js';
import { groupSummary, weakerSource, type SummarySource } from './group-summary.js';
import { tFromTwoTailedP } from './p-value.js';
import { direction as checkDirection, flagged, sampleSize } from './effect-checks.js';
import { smdIndependent } from './smd-independent.js';
import { smdFromT } from './smd-from-t.js';
import { smdFromF } from './smd-from-f.js';
import { smdFromP } from './smd-from-p.js';
import { smdFromCounts } from './smd-from-counts.js';
import { smdPaired, smdPairedFromT } from './smd-paired.js';
import { smdPairedSds } from './smd-paired-sds.js';
import { dzFromConditionSds, dzFromDifferences, dzFromPairedT } from './dz-from-paired-t.js';
import { logRatio } from './log-ratio.js';
import { logRatioFromCi } from './log-ratio-from-ci.js';
import { logRatioPaired } from './log-ratio-paired.js';
import { percentChange } from './percent-change.js';
import { meanDifference, meanDifferenceFromSe, meanDifferenceFromSes } from './mean-difference.js';
import { meanDifferenceFromT } from './mean-difference-from-t.js';
import { meanDifferenceFromCi } from './mean-difference-from-ci.js';
import { meanDifferencePaired } from './mean-difference-paired.js';
import { rawMean, rawMeanFromSe } from './raw-mean.js';
import { fisherZ } from './fisher-z.js';
import { logOddsRatio } from './log-odds-ratio.js';

export { EFFECT_MEASURES } from './effect-fields.js';
export type { EffectInput, EffectMeasure, EffectField } from './effect-fields.js';

export interface EffectOutput {
  measure: EffectMeasure;
  /** what the effect estimates (see effect-metrics.ts); g_z is never the same quantity as g_s, g_av or g_rm */
  metric: EffectMetric;
  effect: number;
  variance: number;
  /** formula id (see formulas.ts) */
  formula: string;
  /** the Hedges J applied (exact form, its df and value), or null for metrics without one */
  hedges_j: HedgesJ | null;
  /** computed from a reported bound (p < …): the effect's size is a lower limit */
  from_bound: boolean;
  /** rests on an estimated mean and SD (from a median with quartiles or range) */
  approximate: boolean;
}

type Values = Partial<Record<EffectField, number>>;

const has = (o: Values, ...keys: EffectField[]) => keys.every((key) => o[key] !== undefined);

function need(measure: string, alternatives: string[]): never {
  throw new StatsInputError(`${measure} needs one of these sets of fields: ${alternatives.join('; ')}`);
}

const GROUPS_TEXT = 'mean1, sd1, n1, mean2, sd2, n2 (se1/se2 for SDs, or median with lower_quartile/upper_quartile and/or min/max for a mean)';

const SUFFIX: Record<SummarySource, string> = { sd: '', se: '.ses', median: '.medians' };

/** Both groups' means and SDs, from SDs, SEs or medians, or null when either group is incomplete. */
function twoGroups(o: Values) {
  const g1 = groupSummary(o, '1');
  const g2 = g1 ? groupSummary(o, '2') : null;
  if (!g1 || !g2) return null;
  return { g1, g2, source: weakerSource(g1.source, g2.source) };
}

/** A signed t from a reported two-tailed p (or its bound) on df, the sign from `direction` (not needed when p = 1). */
function tFromP(o: Values, df: number): { t: number; bound: boolean } {
  const bound = o.p === undefined;
  const t = tFromTwoTailedP(bound ? 'p_less_than' : 'p', bound ? o.p_less_than : o.p, df);
  return { t: t === 0 ? 0 : checkDirection('direction', o.direction) * t, bound };
}

function smd(o: Values): EffectSize {
  const groups = twoGroups(o);
  if (groups) {
    const { g1, g2, source } = groups;
    const es = smdIndependent(g1.mean, g1.sd, g1.n, g2.mean, g2.sd, g2.n, `smd.ind.means${SUFFIX[source]}`);
    return source === 'median' ? flagged(es, 'approximate') : es;
  }
  if (has(o, 't', 'n1', 'n2')) return smdFromT(o.t!, o.n1!, o.n2!);
  if (has(o, 'F', 'n1', 'n2')) return smdFromF(o.F!, o.n1!, o.n2!, o.direction as 1 | -1 | undefined);
  if (has(o, 'p', 'n1', 'n2')) return smdFromP(o.p!, o.n1!, o.n2!, o.direction as 1 | -1 | undefined);
  if (has(o, 'p_less_than', 'n1', 'n2')) return smdFromP(o.p_less_than!, o.n1!, o.n2!, o.direction as 1 | -1 | undefined, true);
  if (has(o, 'events1', 'nonevents1', 'events2', 'nonevents2')) return smdFromCounts(o.events1!, o.nonevents1!, o.events2!, o.nonevents2!);
  need('smd', [GROUPS_TEXT, 't, n1, n2', 'F, n1, n2, direction', 'p, n1, n2, direction', 'p_less_than, n1, n2, direction', 'events1, nonevents1, events2, nonevents2']);
}

function smdPairedForm(o: Values): EffectSize {
  const withR = o.r !== undefined;
  if (has(o, 'mean_diff', 'sd_diff', 'n')) return withR ? smdPaired(o.mean_diff!, o.sd_diff!, o.n!, o.r!) : dzFromDifferences(o.mean_diff!, o.sd_diff!, o.n!);
  if (has(o, 'mean1', 'sd1', 'mean2', 'sd2', 'n', 'r')) return smdPairedSds(o.mean1!, o.sd1!, o.mean2!, o.sd2!, o.n!, o.r!);
  if (has(o, 't', 'n')) return withR ? smdPairedFromT(o.t!, o.n!, o.r!) : dzFromPairedT(o.t!, o.n!);
  if (has(o, 'n') && (o.p !== undefined || o.p_less_than !== undefined)) {
    const { t, bound } = tFromP(o, sampleSize('n', o.n, 3) - 1);
    const es = withR ? smdPairedFromT(t, o.n!, o.r!, 'smd.paired.p_r') : dzFromPairedT(t, o.n!, 'smd.paired.dz_p');
    return bound ? flagged(es, 'from_bound') : es;
  }
  need('smd_paired', [
    'mean_diff, sd_diff, n, r (g_rm; without r: g_z)', 'mean1, sd1, mean2, sd2, n, r (g_av)', 't, n, r (g_rm; without r: g_z)',
    'p or p_less_than, n, direction, r (g_rm; without r: g_z)',
  ]);
}

function dz(o: Values): EffectSize {
  if (has(o, 'mean_diff', 'sd_diff', 'n')) return dzFromDifferences(o.mean_diff!, o.sd_diff!, o.n!);
  if (has(o, 'mean1', 'sd1', 'mean2', 'sd2', 'n', 'r')) return dzFromConditionSds(o.mean1!, o.sd1!, o.mean2!, o.sd2!, o.n!, o.r!);
  if (has(o, 't', 'n')) return dzFromPairedT(o.t!, o.n!);
  if (has(o, 'n') && (o.p !== undefined || o.p_less_than !== undefined)) {
    const { t, bound } = tFromP(o, sampleSize('n', o.n, 3) - 1);
    const es = dzFromPairedT(t, o.n!, 'smd.paired.dz_p');
    return bound ? flagged(es, 'from_bound') : es;
  }
  need('d_z', ['mean_diff, sd_diff, n', 'mean1, sd1, mean2, sd2, n, r', 't, n', 'p or p_less_than, n, direction']);
}

function logRatioForm(o: Values): EffectSize {
  const groups = twoGroups(o);
  if (groups) {
    const { g1, g2, source } = groups;
    const es = logRatio(g1.mean, g1.sd, g1.n, g2.mean, g2.sd, g2.n, `lnrom.ind${SUFFIX[source]}`);
    return source === 'median' ? flagged(es, 'approximate') : es;
  }
  if (has(o, 'ratio', 'ci_lower', 'ci_upper')) return logRatioFromCi(o.ratio!, o.ci_lower!, o.ci_upper!, o.level ?? 0.95, o.df);
  if (has(o, 'percent', 'ci_lower', 'ci_upper')) return logRatioFromCi(o.percent!, o.ci_lower!, o.ci_upper!, o.level ?? 0.95, o.df, true);
  if (has(o, 'percent', 'se')) return percentChange(o.percent!, o.se!);
  need('log_ratio', [GROUPS_TEXT, 'ratio, ci_lower, ci_upper [, level, df]', 'percent, ci_lower, ci_upper [, level, df]', 'percent, se']);
}

function meanDiffForm(o: Values): EffectSize {
  if (has(o, 'mean1', 'se1', 'mean2', 'se2') && !has(o, 'sd1', 'sd2')) return meanDifferenceFromSes(o.mean1!, o.se1!, o.mean2!, o.se2!);
  const groups = twoGroups(o);
  if (groups) {
    const { g1, g2, source } = groups;
    const es = meanDifference(g1.mean, g1.sd, g1.n, g2.mean, g2.sd, g2.n, `md.ind.sds${SUFFIX[source]}`);
    return source === 'median' ? flagged(es, 'approximate') : es;
  }
  if (has(o, 'mean_diff', 'sd_diff', 'n')) return meanDifferencePaired(o.mean_diff!, o.sd_diff!, o.n!);
  if (has(o, 'mean_diff', 'se')) return meanDifferenceFromSe(o.mean_diff!, o.se!);
  if (has(o, 'mean_diff', 't')) return meanDifferenceFromT(o.mean_diff!, o.t!);
  if (has(o, 'mean_diff', 'ci_lower', 'ci_upper')) return meanDifferenceFromCi(o.mean_diff!, o.ci_lower!, o.ci_upper!, o.level ?? 0.95, o.df);
  need('mean_diff', [
    GROUPS_TEXT, 'mean1, se1, mean2, se2', 'mean_diff, sd_diff, n', 'mean_diff, se', 'mean_diff, t', 'mean_diff, ci_lower, ci_upper [, level, df]',
  ]);
}

function rawMeanForm(o: Values): EffectSize {
  if (has(o, 'mean', 'sd', 'n')) return rawMean(o.mean!, o.sd!, o.n!);
  if (has(o, 'mean', 'se')) return rawMeanFromSe(o.mean!, o.se!);
  const g = groupSummary(o, '');
  if (g) return flagged(rawMean(g.mean, g.sd, g.n, 'mean.raw.median'), 'approximate');
  need('raw_mean', ['mean, sd, n', 'mean, se', 'median, n with lower_quartile and upper_quartile and/or min and max']);
}

function logOddsRatioForm(o: Values): EffectSize {
  const rest = (events: EffectField, nonevents: EffectField, n: EffectField) =>
    o[nonevents] !== undefined ? o[nonevents]! : o[n] !== undefined && o[events] !== undefined ? o[n]! - o[events]! : undefined;
  const b = rest('events1', 'nonevents1', 'n1');
  const d = rest('events2', 'nonevents2', 'n2');
  if (o.events1 === undefined || o.events2 === undefined || b === undefined || d === undefined)
    need('log_odds_ratio', ['events1, nonevents1, events2, nonevents2', 'events1, n1, events2, n2']);
  if (b < 0) throw new StatsInputError('events1 must not exceed n1', 'events1');
  if (d < 0) throw new StatsInputError('events2 must not exceed n2', 'events2');
  return logOddsRatio(o.events1, b, o.events2, d);
}

const FORMS: Record<EffectMeasure, (o: Values) => EffectSize> = {
  smd,
  smd_paired: smdPairedForm,
  d_z: dz,
  log_ratio: logRatioForm,
  log_ratio_paired: (o) => {
    if (!has(o, 'mean1', 'sd1', 'mean2', 'sd2', 'n', 'r')) need('log_ratio_paired', ['mean1, sd1, mean2, sd2, n, r']);
    return logRatioPaired(o.mean1!, o.sd1!, o.mean2!, o.sd2!, o.n!, o.r!);
  },
  mean_diff: meanDiffForm,
  raw_mean: rawMeanForm,
  fisher_z: (o) => {
    if (!has(o, 'r', 'n')) need('fisher_z', ['r, n']);
    return fisherZ(o.r!, o.n!);
  },
  log_odds_ratio: logOddsRatioForm,
};

/**
 * One entry point for the effect-size calculators, keyed by `measure` (the fields of each are in
 * effect-fields.ts; the alternative is chosen by which fields are present, in this order):
 * - smd (g_s): two groups' means and SDs (or SEs, or medians with quartiles/range, flagged approximate) | t, n1, n2 |
 *   F, n1, n2, direction | p, n1, n2, direction | p_less_than, … (flagged from_bound) | 2×2 counts (Chinn 2000)
 * - smd_paired: mean_diff, sd_diff, n, r → g_rm | mean1, sd1, mean2, sd2, n, r → g_av | t, n, r → g_rm |
 *   p (or p_less_than), n, direction, r → g_rm; the same without r → g_z (a paired t with no r stays g_z)
 * - d_z (g_z): mean_diff, sd_diff, n | mean1, sd1, mean2, sd2, n, r | t, n | p (or p_less_than), n, direction
 * - log_ratio: two groups' means and SDs (SEs, medians) | ratio or percent with ci_lower, ci_upper [, level, df] | percent, se
 * - log_ratio_paired: mean1, sd1, mean2, sd2, n, r
 * - mean_diff: two groups (SDs, SEs, medians) | mean1, se1, mean2, se2 | mean_diff with sd_diff and n, se, t, or a centred CI
 * - raw_mean: mean, sd, n | mean, se | median with quartiles and/or range, n
 * - fisher_z: r, n; log_odds_ratio: events1, nonevents1 (or n1), events2, nonevents2 (or n2)
 * Returns { measure, metric, effect, variance, formula, hedges_j, from_bound, approximate }; throws
 * StatsInputError naming the field on missing or invalid values.
 * Example: computeEffect({ measure: 'fisher_z', r: 0.5, n: 103 }) → { metric 'fisher_z', effect ≈ 0.5493, variance 0.01 }.
 */
export function computeEffect(input: unknown): EffectOutput {
  const { measure, values } = readEffectInput(input);
  const es = FORMS[measure](values);
  return {
    measure,
    metric: es.metric,
    effect: es.effect,
    variance: es.variance,
    formula: es.formula,
    hedges_j: es.hedges_j ?? null,
    from_bound: es.from_bound ?? false,
    approximate: es.approximate ?? false,
  };
}
