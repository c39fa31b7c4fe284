import { CONTINUOUS_MODERATORS, type RegressionModerator, type SynthesisRequest } from '../schemas/synthesis.js';
import { labelOf } from '../vocabulary/labels.js';
import { metaRegression, pool, StatsInputError, type Method } from './engine.js';
import type { EstimatorRow, PooledRow, RegressionTerm, SettledEffect, SeveralModeratorsResult } from './types.js';

/** Which I² an estimator reports: REML and PM the τ²-based one (Higgins & Thompson 2002), DL and FE the Q-based one (equal to it for DL). */
export const i2Definition = (method: Method): 'q' | 'tau' => (method === 'REML' || method === 'PM' ? 'tau' : 'q');

/**
 * The I² of a result or row under its estimator's one definition (see i2Definition). Rows without I2_tau (older
 * snapshots; the three-level model, whose I² is already from its variance components) keep their I2.
 */
export function estimatorI2(method: Method, row: { I2: number | null; I2_tau?: number | null }): number | null {
  return i2Definition(method) === 'tau' ? (row.I2_tau ?? row.I2) : row.I2;
}

const ESTIMATORS: Method[] = ['FE', 'DL', 'REML', 'PM'];

/**
 * τ² and I² by every estimator over the same studies, each I² from that estimator's own τ² and the typical
 * within-study variance (Higgins & Thompson 2002; for DL this is the Q-based I², for FE I² from Q), H² = 1/(1 − I²)
 * (FE: Q/df), as metafor's rma reports them.
 */
export function estimatorTable(y: ArrayLike<number>, v: ArrayLike<number>, hksj: boolean, level: number): EstimatorRow[] {
  return ESTIMATORS.map((method) => {
    const r = pool({ effects: y, variances: v, method, hksj, level });
    const I2 = method === 'FE' ? r.I2 : (r.I2_tau ?? r.I2);
    const H2 = method === 'FE' ? r.H2 : I2 == null ? null : 100 / (100 - I2);
    return {
      method,
      label: labelOf('estimator', method),
      estimate: r.estimate,
      ci_lower: r.ci_lower,
      ci_upper: r.ci_upper,
      tau2: r.tau2,
      tau2_ci_lower: r.tau2_ci_lower,
      tau2_ci_upper: r.tau2_ci_upper,
      I2,
      H2,
    };
  });
}

/** A pooled unit's value of a moderator: the year, the mean standard duration, or the category its effects share ('several' when they differ). */
function unitValue(row: PooledRow, effects: SettledEffect[], moderator: RegressionModerator): number | string | null {
  if (moderator === 'year') return row.year;
  if (moderator === 'standardMs') {
    const xs = effects.map((e) => e.standardMs).filter((x): x is number => x != null);
    return xs.length ? xs.reduce((a, b) => a + b, 0) / xs.length : null;
  }
  const values = new Set(effects.map((e) => e[moderator]).filter((x): x is string => x != null && x !== ''));
  if (values.size === 0) return null;
  return values.size === 1 ? [...values][0] : 'several';
}

const levelLabel = (moderator: RegressionModerator, level: string) => (level === 'several' ? 'several' : labelOf(moderator, level));

/**
 * The mixed-effects meta-regression on several moderators at once over the pooled units (metaRegression in
 * shared/stats: residual τ² by the request's estimator, DL as the method of moments; Knapp–Hartung t and F when
 * hksj), categories dummy-coded against their first level in code order (as R's factor()). Units without a value
 * of any chosen moderator are left out and counted. Throws, in words, when it cannot be fitted.
 */
export function severalModerators(rows: readonly PooledRow[], effects: readonly SettledEffect[], request: SynthesisRequest, moderators: readonly RegressionModerator[]): SeveralModeratorsResult {
  const byId = new Map(effects.map((e) => [e.id, e]));
  const values = rows.map((r) => {
    const own = r.effectIds.map((id) => byId.get(id)).filter((e): e is SettledEffect => e !== undefined);
    return moderators.map((m) => unitValue(r, own, m));
  });
  const kept = rows.flatMap((_, i) => (values[i].every((x) => x !== null) ? [i] : []));
  const columns = moderators.map((m, j) => {
    const xs = kept.map((i) => values[i][j]!);
    const continuous = CONTINUOUS_MODERATORS.includes(m);
    if (!continuous && new Set(xs).size < 2)
      throw new StatsInputError(`${labelOf('moderator', m)} takes only one value among these studies${xs.length ? ` (${levelLabel(m, String(xs[0]))})` : ''}: leave it out of the meta-regression`, 'moderators');
    return { name: m, values: continuous ? (xs as number[]) : xs.map(String) };
  });
  if (kept.length < 3) throw new StatsInputError(`needs at least 3 studies with a value of every chosen moderator (${kept.length} here)`, 'moderators');
  const fit = metaRegression({
    effects: kept.map((i) => rows[i].effect),
    variances: kept.map((i) => rows[i].variance),
    moderators: columns,
    method: request.method,
    hksj: request.hksj,
    level: request.level,
  });
  // coefficient order: the intercept, then each moderator's column(s) in the order chosen
  const owners: Array<{ moderator: RegressionModerator | null; level: string | null }> = [{ moderator: null, level: null }];
  for (const s of fit.moderators) {
    const m = s.name as RegressionModerator;
    if (s.type === 'continuous') owners.push({ moderator: m, level: null });
    else for (const level of s.levels!.slice(1)) owners.push({ moderator: m, level });
  }
  const terms: RegressionTerm[] = fit.coefficients.map((c, a) => {
    const { moderator, level } = owners[a];
    const label = moderator === null ? 'Intercept' : level === null ? labelOf('moderator', moderator) : `${labelOf('moderator', moderator)}: ${levelLabel(moderator, level)}`;
    return { label, moderator, level, estimate: c.estimate, se: c.se, statistic: c.statistic, df: c.statistic_df, p: c.p, ci_lower: c.ci_lower, ci_upper: c.ci_upper };
  });
  const random = request.method !== 'FE';
  return {
    moderators: fit.moderators.map((s) => {
      const m = s.name as RegressionModerator;
      const reference = s.type === 'categorical' ? s.levels![0] : null;
      return { moderator: m, label: labelOf('moderator', m), type: s.type, reference, referenceLabel: reference === null ? null : levelLabel(m, reference) };
    }),
    k: fit.k,
    missing: rows.length - kept.length,
    method: request.method,
    hksj: fit.hksj,
    terms,
    tau2: random ? fit.tau2 : null,
    tau2_total: random ? fit.tau2_total : null,
    R2: random ? fit.R2 : null,
    QM: fit.QM,
    QM_df: fit.QM_df,
    QM_df2: fit.QM_df2,
    QM_test: fit.QM_test,
    QM_p: fit.QM_p,
    QE: fit.QE,
    QE_df: fit.QE_df,
    QE_p: fit.QE_p,
    fewPerCovariate: fit.few_effects_per_covariate,
  };
}
