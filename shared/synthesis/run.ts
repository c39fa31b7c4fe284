import { pooledMetric } from './metric-choice.js';
import { MODERATOR_LABELS, SENSITIVITY_RS, type Dependence, type SynthesisRequest, type SubgroupVariable } from '../schemas/synthesis.js';
import { forestFigure, type ForestSummary } from '../plots/forest.js';
import { funnelFigure } from '../plots/funnel.js';
import { bubbleFigure } from '../plots/bubble.js';
import { begg, cumulative, leaveOneOut, metaRegression, normalTwoTailed, pool, subgroups as subgroupAnalysis, tTwoTailed, trimFill, type PoolResult, type SensitivityEntry } from './engine.js';
import { applyDependence, type StudyUnit } from './dependence.js';
import { cautionsFor } from './cautions.js';
import { valueLabel } from './labels.js';
import { multilevelPart } from './run-multilevel.js';
import { estimatorTable, severalModerators } from './analyses.js';
import type { CorrelationSensitivityRow, MetaRegressionResult, PlotFigure, PooledRow, SensitivityRow, SettledEffect, SubgroupComparison, SynthesisOutput } from './types.js';

export class NoEffectsError extends Error {
  constructor() {
    super('No settled effects match these filters. Widen the filters (fewer fields, a longer year range) and run it again.');
  }
}

/** Tables of refits are returned up to this many studies (the pooled numbers always cover every study). */
export const SENSITIVITY_MAX_STUDIES = 1000;
/** REML and Paule–Mandel refit every subset: beyond this many studies the refits are skipped. */
const ITERATIVE_REFIT_MAX = 400;
/** Code-point order: localeCompare (ICU) costs more than the whole pooling for a few hundred studies. */
const cmp = (a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0);
/** Trim-and-fill re-ranks every study each round: beyond this it is skipped (stated in `unavailable`). */
const TRIMFILL_MAX_STUDIES = 3000;
/** Begg's test is O(k²) in pairs. */
const BEGG_MAX_STUDIES = 3000;

export { metricLabel, MixedMetricsError, MixedOutcomesError, MixedQuantitiesError } from './metric-choice.js';

function subgroupValue(unit: StudyUnit, variable: SubgroupVariable): string {
  const values = new Set(unit.effects.map((e) => e[variable] ?? 'not reported'));
  return values.size === 1 ? String([...values][0]) : 'several';
}

function moderatorValue(unit: StudyUnit, moderator: 'standardMs' | 'year'): number | null {
  if (moderator === 'year') return unit.year;
  const xs = unit.effects.map((e) => e.standardMs).filter((x): x is number => x != null);
  return xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null;
}

const summary = (label: string, r: PoolResult): ForestSummary => ({
  label,
  estimate: r.estimate,
  ci_lower: r.ci_lower,
  ci_upper: r.ci_upper,
  pi_lower: r.pi_lower,
  pi_upper: r.pi_upper,
});

/** What a dependence mode contributes to the one pipeline of runSynthesis: its rows and model, and its own analyses. */
export interface ModelPart {
  /** in row order, with subgroup and moderator set */
  rows: PooledRow[];
  result: PoolResult;
  counts: SynthesisOutput['counts'];
  /** the subgroup comparison (values as in rows[].subgroup); may throw, or name skipped groups in `unavailable` */
  subgroups: (labelOf: (value: string) => string) => SubgroupComparison;
  /** the one-moderator fit over the rows at these indices */
  regress: (rowsWithX: number[]) => Omit<MetaRegressionResult, 'moderator' | 'missing'>;
  /** leave-one-out, cumulative and the small-study tests, each null when not run (the reason in `unavailable`) */
  refits: () => Pick<SynthesisOutput, 'leaveOneOut' | 'cumulative' | 'begg' | 'trimFill'>;
  forest: (subgroups: SubgroupComparison | null) => PlotFigure;
  funnelTrimFill: (trimFill: SynthesisOutput['trimFill']) => { estimate: number; filled: Array<{ effect: number; variance: number }> } | null;
  /** the cautions and the mode's own fields (multilevel, correlationSensitivity, papersWithSeveralEffects) */
  finish: (result: PoolResult) => Pick<SynthesisOutput, 'cautions' | 'multilevel' | 'correlationSensitivity' | 'papersWithSeveralEffects'>;
}

/** Where analyses that could not run are named: `attempt` runs one and records its refusal. */
export interface AnalysisLog {
  unavailable: SynthesisOutput['unavailable'];
  attempt: <T>(analysis: string, f: () => T) => T | null;
}

/**
 * The whole synthesis as a pure function of the settled effects that matched the filters: the dependence
 * mode's model (one unit per study by aggregation or one kept, or every effect under the three-level model),
 * then the same subgroups, meta-regression, refits, cautions and figures for every mode.
 */
export function runSynthesis(effects: readonly SettledEffect[], request: SynthesisRequest): SynthesisOutput {
  if (!effects.length) throw new NoEffectsError();
  const { metric, label: mLabel } = pooledMetric(effects, request);
  const unavailable: SynthesisOutput['unavailable'] = [];
  const log: AnalysisLog = {
    unavailable,
    attempt: (analysis, f) => {
      try {
        return f();
      } catch (err) {
        unavailable.push({ analysis, reason: (err as Error).message });
        return null;
      }
    },
  };
  const dependence = request.dependence;
  const part = dependence.mode === 'multilevel' ? multilevelPart(effects, { ...request, dependence }, metric, mLabel, log) : studyPart(effects, { ...request, dependence }, metric, mLabel, log);
  const { rows, result } = part;

  // Subgroups: a separate heterogeneity within each, compared with Q between the subgroup estimates (Borenstein et al. 2009, ch. 19).
  const sg = request.subgroup;
  let subgroups: SubgroupComparison | null = null;
  if (sg) {
    const manipulationLabels = new Map(effects.map((e) => [e.manipulation, e.manipulationLabel ?? e.manipulation]));
    const labelOf = (value: string) => (sg === 'manipulation' ? (manipulationLabels.get(value) ?? value) : valueLabel(sg, value));
    subgroups = log.attempt('subgroups', () => part.subgroups(labelOf));
  }

  const refits = part.refits();

  // Several moderators at once, and τ² and I² by every estimator: over the pooled units of a two-level model.
  let regression: SynthesisOutput['regression'] = null;
  let estimators: SynthesisOutput['estimators'] = null;
  if (dependence.mode === 'multilevel') {
    if (request.moderators) unavailable.push({ analysis: 'meta-regression on several moderators', reason: 'not fitted under the three-level model; combine or keep one effect per study to run it' });
    if (sg && request.subgroupTau2 === 'pooled') unavailable.push({ analysis: 'one τ² shared by all subgroups', reason: 'the three-level model fits each subgroup separately' });
  } else {
    if (request.moderators) {
      const chosen = request.moderators;
      regression = log.attempt('meta-regression on several moderators', () => severalModerators(rows, effects, request, chosen));
    }
    if (rows.length >= 2) estimators = log.attempt('estimators compared', () => estimatorTable(rows.map((r) => r.effect), rows.map((r) => r.variance), request.hksj, request.level));
  }

  let metaReg: SynthesisOutput['metaRegression'] = null;
  const mod = request.moderator;
  if (mod) {
    const withX = rows.flatMap((r, i) => (r.moderator != null ? [i] : []));
    const fit = log.attempt('meta-regression', () => part.regress(withX));
    if (fit) metaReg = { moderator: mod, ...fit, missing: rows.length - withX.length };
  }

  const funnel =
    rows.length >= 2
      ? funnelFigure({
          metric,
          metricLabel: mLabel,
          studies: rows,
          pooled: result.estimate,
          trimFill: part.funnelTrimFill(refits.trimFill),
        })
      : null;
  const bubble =
    mod && metaReg
      ? bubbleFigure({
          metric,
          metricLabel: mLabel,
          moderatorLabel: MODERATOR_LABELS[mod],
          points: rows.flatMap((r) => (r.moderator != null ? [{ label: r.label, x: r.moderator, effect: r.effect, weight: r.weight }] : [])),
          fit: { intercept: metaReg.intercept, slope: metaReg.slope, slope_p: metaReg.slope_p },
        })
      : null;
  const forest = part.forest(subgroups);
  const finished = part.finish(result);
  if (regression?.fewPerCovariate)
    finished.cautions.splice(finished.cautions.length - 1, 0, {
      code: 'few_per_covariate',
      text: `The meta-regression on several moderators has ${regression.k} studies for ${regression.terms.length - 1} ${regression.terms.length === 2 ? 'coefficient' : 'coefficients'}: fewer than 10 studies per coefficient (common practice), so its estimates are unstable.`,
    });

  return {
    request,
    metric,
    counts: part.counts,
    dependence: request.dependence,
    rows,
    result,
    subgroups,
    ...refits,
    metaRegression: metaReg,
    regression,
    estimators,
    figures: { forest, funnel, bubble },
    ...finished,
    unavailable,
  };
}

/** Aggregation or one effect per study: one unit per study, pooled by the chosen estimator. */
function studyPart(
  effects: readonly SettledEffect[],
  request: SynthesisRequest & { dependence: Exclude<Dependence, { mode: 'multilevel' }> },
  metric: string,
  mLabel: string,
  { unavailable, attempt }: AnalysisLog,
): ModelPart {
  const dependence = request.dependence;
  const opts = { method: request.method, hksj: request.hksj, level: request.level };
  const sg = request.subgroup;
  const units = applyDependence(effects, dependence)
    .map((u) => ({ u, group: sg ? subgroupValue(u, sg) : undefined }))
    .sort((a, b) => cmp(a.group ?? '', b.group ?? '') || (a.u.year ?? 9999) - (b.u.year ?? 9999) || cmp(a.u.label, b.u.label) || a.u.studyId - b.u.studyId);
  const k = units.length;
  const y = new Float64Array(k);
  const v = new Float64Array(k);
  units.forEach(({ u }, i) => {
    y[i] = u.effect;
    v[i] = u.variance;
  });
  const result = pool({ effects: y, variances: v, ...opts });

  const rows: PooledRow[] = units.map(({ u, group }, i) => {
    const row: PooledRow = { studyId: u.studyId, referenceId: u.referenceId, label: u.label, effect: u.effect, variance: u.variance, year: u.year, n: u.n, effectIds: u.effects.map((e) => e.id), weight: result.weights[i] };
    if (group !== undefined) row.subgroup = group;
    if (request.moderator) row.moderator = moderatorValue(u, request.moderator);
    return row;
  });

  const subgroups = (labelOf: (value: string) => string): SubgroupComparison => {
    const sub = subgroupAnalysis({ effects: y, variances: v, groups: rows.map((r) => r.subgroup!), ...opts, tau2Model: request.subgroupTau2 ?? 'separate' });
    return {
      variable: sg!,
      groups: sub.groups.map((r) => ({ value: r.group, label: labelOf(r.group), k: r.k, estimate: r.estimate, se: r.se, ci_lower: r.ci_lower, ci_upper: r.ci_upper, tau2: r.tau2, I2: r.I2, I2_tau: r.I2_tau, p: r.p })),
      tau2Model: sub.tau2_model,
      tau2_pooled: sub.tau2_pooled,
      Q_between: sub.Q_between,
      df: sub.Q_between_df,
      df2: sub.Q_between_df2,
      test: sub.Q_between_test,
      p: sub.Q_between_p,
    };
  };

  const regress = (withX: number[]) => {
    const fit = metaRegression({ effects: withX.map((i) => y[i]), variances: withX.map((i) => v[i]), moderator: withX.map((i) => rows[i].moderator as number), method: request.method, hksj: request.hksj, level: request.level });
    const slope = fit.coefficients[1];
    return { k: fit.k, intercept: fit.coefficients[0].estimate, slope: slope.estimate, slope_se: slope.se, slope_ci_lower: slope.ci_lower, slope_ci_upper: slope.ci_upper, slope_p: slope.p, slope_df: slope.statistic_df, tau2: fit.tau2, R2: fit.R2 };
  };

  const refits = (): ReturnType<ModelPart['refits']> => {
    const sensitivityRows = (entries: SensitivityEntry[], order: number[]): SensitivityRow[] =>
      entries.map((e, j) => {
        const u = units[order[j]].u;
        return { label: u.label, studyId: u.studyId, year: u.year, k: e.k, estimate: e.estimate, ci_lower: e.ci_lower, ci_upper: e.ci_upper, p: e.statistic_df === null ? normalTwoTailed(e.estimate / e.se) : tTwoTailed(e.estimate / e.se, e.statistic_df), tau2: e.tau2, I2: e.I2, I2_tau: e.I2_tau };
      });
    const refitsAllowed = (what: string) => {
      if (k > SENSITIVITY_MAX_STUDIES) {
        unavailable.push({ analysis: what, reason: `not tabulated for more than ${SENSITIVITY_MAX_STUDIES} studies (${k} here)` });
        return false;
      }
      if ((request.method === 'REML' || request.method === 'PM') && k > ITERATIVE_REFIT_MAX) {
        unavailable.push({ analysis: what, reason: `${request.method} refits every subset; not run for more than ${ITERATIVE_REFIT_MAX} studies (use DL or FE)` });
        return false;
      }
      return true;
    };
    const identity = units.map((_, i) => i);
    const leaveOut = k >= 2 && refitsAllowed('leave-one-out') ? attempt('leave-one-out', () => sensitivityRows(leaveOneOut({ effects: y, variances: v, ...opts }), identity)) : null;
    let cumulativeRows: SensitivityRow[] | null = null;
    if (refitsAllowed('cumulative')) {
      // by year, then label; studies without a year last
      const order = [...identity].sort((a, b) => (units[a].u.year ?? 9999) - (units[b].u.year ?? 9999) || cmp(units[a].u.label, units[b].u.label));
      cumulativeRows = attempt('cumulative', () => sensitivityRows(cumulative({ effects: order.map((i) => y[i]), variances: order.map((i) => v[i]), ...opts }), order));
    }

    const tf = k >= 3 && k <= TRIMFILL_MAX_STUDIES ? attempt('trim-and-fill', () => trimFill({ effects: y, variances: v, ...opts })) : null;
    if (k < 3) unavailable.push({ analysis: 'trim-and-fill', reason: 'needs at least 3 studies' });
    if (k > TRIMFILL_MAX_STUDIES) unavailable.push({ analysis: 'trim-and-fill', reason: `re-ranks every study in each round; not run for more than ${TRIMFILL_MAX_STUDIES} studies (${k} here)` });
    let beggResult: SynthesisOutput['begg'] = null;
    if (k < 3) unavailable.push({ analysis: "Begg's test", reason: 'needs at least 3 studies' });
    else if (k > BEGG_MAX_STUDIES) unavailable.push({ analysis: "Begg's test", reason: `compares every pair of studies; not run for more than ${BEGG_MAX_STUDIES} studies (${k} here)` });
    else {
      const b = attempt("Begg's test", () => begg({ effects: y, variances: v }));
      if (b) beggResult = { tau: b.tau, z: b.z, p: b.p, p_method: b.p_method };
    }
    return {
      leaveOneOut: leaveOut,
      cumulative: cumulativeRows,
      begg: beggResult,
      trimFill: tf ? { side: tf.side, k0: tf.k0, estimate: tf.estimate, ci_lower: tf.ci_lower, ci_upper: tf.ci_upper, imputed: tf.filled } : null,
    };
  };

  const pooledLabel = request.method === 'FE' ? 'Fixed-effect estimate' : `Random-effects estimate (${request.method}${request.hksj ? ', HKSJ' : ''})`;
  return {
    rows,
    result,
    counts: { effects: effects.length, studies: k, references: new Set(rows.map((r) => r.referenceId)).size },
    subgroups,
    regress,
    refits,
    forest: (groups) =>
      forestFigure({
        metric,
        metricLabel: mLabel,
        level: request.level,
        studies: rows.map((r) => ({ label: r.label, year: r.year, n: r.n, effect: r.effect, variance: r.variance, weight: r.weight, group: r.subgroup })),
        pooled: summary(pooledLabel, result),
        subgroups: groups?.groups.map((g) => ({ key: g.value, label: g.label, estimate: g.estimate, ci_lower: g.ci_lower, ci_upper: g.ci_upper })),
      }),
    funnelTrimFill: (tf) => (tf ? { estimate: tf.estimate, filled: tf.imputed } : null),
    finish: (res) => ({
      cautions: cautionsFor(res, k),
      correlationSensitivity:
        dependence.mode === 'aggregate' && units.length < effects.length ? attempt('correlation sensitivity', () => overCorrelations(effects, dependence, opts)) : null,
      papersWithSeveralEffects: papersWithSeveralEffects(effects),
    }),
  };
}

export function papersWithSeveralEffects(effects: readonly SettledEffect[]): number {
  const n = new Map<number, number>();
  for (const e of effects) n.set(e.referenceId, (n.get(e.referenceId) ?? 0) + 1);
  let several = 0;
  for (const c of n.values()) if (c > 1) several++;
  return several;
}

/**
 * The pooled estimate with the studies' effects combined at each r of SENSITIVITY_RS (same composite and model).
 * One pass gathers each study's sums; each r then costs O(studies): the plain mean's variance is
 * (Σv + r((Σ√v)² − Σv))/m² (Borenstein et al. 2009, ch. 24), the inverse-variance composite's is as in
 * aggregateWithinStudy (both checked against metafor's aggregate.escalc in tests/reference).
 */
function overCorrelations(effects: readonly SettledEffect[], d: Extract<Dependence, { mode: 'aggregate' }>, opts: { method: SynthesisRequest['method']; hksj: boolean; level: number }): CorrelationSensitivityRow[] {
  const index = new Map<number, number>();
  const m: number[] = [], sy: number[] = [], sv: number[] = [], sq: number[] = [], s1: number[] = [], s2: number[] = [], s1y: number[] = [], s2y: number[] = [];
  for (const e of effects) {
    let j = index.get(e.studyId);
    if (j === undefined) {
      j = m.length;
      index.set(e.studyId, j);
      for (const a of [m, sy, sv, sq, s1, s2, s1y, s2y]) a.push(0);
    }
    const root = Math.sqrt(e.variance);
    m[j]++;
    sy[j] += e.effect;
    sv[j] += e.variance;
    sq[j] += root;
    s1[j] += 1 / root;
    s2[j] += 1 / e.variance;
    s1y[j] += e.effect / root;
    s2y[j] += e.effect / e.variance;
  }
  const J = m.length;
  return SENSITIVITY_RS.map((r) => {
    const y = new Float64Array(J);
    const v = new Float64Array(J);
    for (let j = 0; j < J; j++) {
      const n = m[j];
      if (n === 1) {
        y[j] = sy[j];
        v[j] = sv[j];
      } else if (d.weighted) {
        const c = r / (1 + (n - 1) * r);
        const precision = (s2[j] - c * s1[j] * s1[j]) / (1 - r);
        y[j] = (s2y[j] - c * s1[j] * s1y[j]) / (1 - r) / precision;
        v[j] = 1 / precision;
      } else {
        y[j] = sy[j] / n;
        v[j] = (sv[j] + r * (sq[j] * sq[j] - sv[j])) / (n * n);
      }
    }
    const res = pool({ effects: y, variances: v, ...opts });
    return { r, k: res.k, estimate: res.estimate, se: res.se, ci_lower: res.ci_lower, ci_upper: res.ci_upper, p: res.p, tau2: res.tau2, I2: res.I2, I2_tau: res.I2_tau };
  });
}
