import { StatsInputError } from './errors.js';
import { prepareData } from './validate-input.js';
import { residualTau2, type ResidualMethod } from './residual-tau2.js';
import { weightedRegression } from './weighted-regression.js';
import { invertMatrix } from './small-matrix.js';
import { chiSquareUpperTail } from './chi-square.js';
import { normalQuantileUpper, normalTwoTailed } from './normal.js';
import { tQuantileUpper, tTwoTailed } from './student-t.js';
import { fUpperTail } from './f-distribution.js';
import type { NumericArray } from './types.js';

/** One moderator column: numbers (continuous) or strings (categorical, dummy-coded against `reference`, default the first level in sorted order). */
export interface ModeratorColumn {
  name: string;
  values: ArrayLike<number> | ArrayLike<string>;
  reference?: string;
}

export interface MetaRegressionInput {
  effects: NumericArray;
  variances: NumericArray;
  /** a single moderator, one value per effect (numbers or strings); or use `moderators` */
  moderator?: ArrayLike<number> | ArrayLike<string>;
  /** several moderators at once (numeric columns and dummy-coded categories) */
  moderators?: ModeratorColumn[];
  /** residual τ² estimator: "MM" (method of moments; "DL" is accepted for it), "REML", "PM" or "FE"; default "MM" */
  method?: ResidualMethod | 'DL';
  /** Knapp–Hartung: covariance scaled by the weighted residual variance, t tests on k − p df, F for Q_M; default false */
  hksj?: boolean;
  level?: number;
}

export interface RegressionCoefficient {
  name: string;
  estimate: number;
  se: number;
  /** estimate/se (a t value under Knapp–Hartung; kept under this name for existing callers) */
  z: number;
  statistic: number;
  /** null for z tests, k − p under Knapp–Hartung */
  statistic_df: number | null;
  p: number;
  ci_lower: number;
  ci_upper: number;
}

export interface ModeratorSummary {
  name: string;
  type: 'continuous' | 'categorical';
  /** categorical: the levels, the reference first */
  levels: string[] | null;
}

export interface MetaRegressionResult {
  k: number;
  method: ResidualMethod;
  hksj: boolean;
  level: number;
  /** 'mixed' when several moderators of both kinds */
  moderator_type: 'continuous' | 'categorical' | 'mixed';
  /** single categorical moderator: the levels, the first being the reference; else null */
  levels: string[] | null;
  moderators: ModeratorSummary[];
  coefficients: RegressionCoefficient[];
  /** single continuous moderator: the slope, its SE and p; else null */
  slope: number | null;
  slope_se: number | null;
  slope_p: number | null;
  /** residual τ² with the moderators, and τ² of the intercept-only model by the same estimator */
  tau2: number;
  tau2_total: number;
  /** proportion of τ² explained, max(0, (τ²_total − τ²)/τ²_total); null when τ²_total = 0 */
  R2: number | null;
  /** omnibus test of the moderator coefficients: χ² on QM_df, or under Knapp–Hartung F on (QM_df, QM_df2) with QM the F value */
  QM: number;
  QM_df: number;
  QM_df2: number | null;
  QM_test: 'chisq' | 'F';
  QM_p: number;
  /** residual heterogeneity Q_E on k − p df */
  QE: number;
  QE_df: number;
  QE_p: number;
  /** fewer than 10 effects per moderator coefficient (common practice: the fit is then unstable) */
  few_effects_per_covariate: boolean;
}

/** A validated design: row-major X (k×p) with coefficient names. */
export interface Design {
  X: Float64Array;
  p: number;
  names: string[];
  moderators: ModeratorSummary[];
}

function column(mod: ModeratorColumn, k: number, label: string): { columns: Float64Array[]; names: string[]; summary: ModeratorSummary } {
  const values = mod.values as ArrayLike<unknown>;
  if (!values || typeof values !== 'object' || values.length !== k)
    throw new StatsInputError(`${label} must have one value per effect (${k})`, label);
  if (typeof values[0] === 'string') {
    for (let i = 0; i < k; i++)
      if (typeof values[i] !== 'string') throw new StatsInputError(`${label}[${i}] must be a string like the others`, label);
    let levels = [...new Set(Array.from(values as ArrayLike<string>))].sort();
    if (levels.length < 2) throw new StatsInputError(`${label} must have at least 2 levels`, label);
    if (mod.reference !== undefined) {
      if (!levels.includes(mod.reference)) throw new StatsInputError(`${label}: reference level ${JSON.stringify(mod.reference)} does not occur`, label);
      levels = [mod.reference, ...levels.filter((l) => l !== mod.reference)];
    }
    const columns = levels.slice(1).map((level) => Float64Array.from({ length: k }, (_, i) => (values[i] === level ? 1 : 0)));
    return { columns, names: levels.slice(1).map((l) => `${mod.name}: ${l}`), summary: { name: mod.name, type: 'categorical', levels } };
  }
  const col = new Float64Array(k);
  for (let i = 0; i < k; i++) {
    const x = values[i];
    if (typeof x !== 'number' || !Number.isFinite(x)) throw new StatsInputError(`${label}[${i}] must be a finite number`, label);
    col[i] = x;
  }
  return { columns: [col], names: [mod.name], summary: { name: mod.name, type: 'continuous', levels: null } };
}

/** Intercept plus each moderator's columns (numbers as they are, categories as 0/1 indicators). */
export function buildDesign(moderators: ModeratorColumn[], k: number, labels: string[]): Design {
  const cols: Float64Array[] = [Float64Array.from({ length: k }, () => 1)];
  const names = ['intercept'];
  const summaries: ModeratorSummary[] = [];
  moderators.forEach((m, j) => {
    const c = column(m, k, labels[j]);
    cols.push(...c.columns);
    names.push(...c.names);
    summaries.push(c.summary);
  });
  const p = cols.length;
  const X = new Float64Array(k * p);
  for (let i = 0; i < k; i++) for (let a = 0; a < p; a++) X[i * p + a] = cols[a][i];
  return { X, p, names, moderators: summaries };
}

export interface ModelFit {
  tau2: number;
  beta: Float64Array;
  /** covariance of beta (scaled by the Knapp–Hartung factor when hksj) */
  cov: Float64Array;
  /** residual df k − p */
  dfResid: number;
  coefficients: RegressionCoefficient[];
  /** Wald test of coefficients `tested` (indices): χ² value, or the F value under Knapp–Hartung */
  test(tested: number[]): { statistic: number; df: number; df2: number | null; p: number; kind: 'chisq' | 'F' };
}

/**
 * The mixed-effects model y = Xβ + u + e, u ~ N(0, τ²), e ~ N(0, vᵢ): τ² by `method` (residual-tau2.ts), β by
 * weighted least squares with weights 1/(vᵢ + τ²) (Raudenbush 2009). With `hksj`, Knapp & Hartung (2003):
 * Var(β) = s²·(X′WX)⁻¹, s² = Σwᵢeᵢ²/(k − p), t tests on k − p df and F = β′V⁻¹β/m on (m, k − p) df.
 */
export function fitMixedModel(y: Float64Array, v: Float64Array, design: Design, method: ResidualMethod, hksj: boolean, level: number): ModelFit {
  const { X, p, names } = design;
  const k = y.length;
  const tau2 = residualTau2(y, v, X, p, method);
  const fit = Number.isFinite(tau2) ? weightedRegression(y, v, X, p, tau2) : null;
  if (!fit) throw new StatsInputError('the moderators do not vary enough to be estimated together (singular design)', 'moderators');
  const dfResid = k - p;
  const scale = hksj ? fit.Qres / dfResid : 1;
  const cov = Float64Array.from(fit.cov, (c) => c * scale);
  const statisticDf = hksj ? dfResid : null;
  const alpha = (1 - level) / 2;
  const crit = statisticDf === null ? normalQuantileUpper(alpha) : tQuantileUpper(alpha, statisticDf);
  const coefficients: RegressionCoefficient[] = names.map((name, a) => {
    const estimate = fit.beta[a];
    const se = Math.sqrt(cov[a * p + a]);
    const statistic = estimate / se;
    const pValue = statisticDf === null ? normalTwoTailed(statistic) : tTwoTailed(statistic, statisticDf);
    return { name, estimate, se, z: statistic, statistic, statistic_df: statisticDf, p: pValue, ci_lower: estimate - crit * se, ci_upper: estimate + crit * se };
  });
  const test = (tested: number[]) => {
    const m = tested.length;
    const sub = new Float64Array(m * m);
    for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) sub[a * m + b] = cov[tested[a] * p + tested[b]];
    const inv = invertMatrix(sub, m);
    let Q = NaN;
    if (inv) {
      Q = 0;
      for (let a = 0; a < m; a++) for (let b = 0; b < m; b++) Q += fit.beta[tested[a]] * inv[a * m + b] * fit.beta[tested[b]];
    }
    if (hksj) return { statistic: Q / m, df: m, df2: dfResid, p: fUpperTail(Q / m, m, dfResid), kind: 'F' as const };
    return { statistic: Q, df: m, df2: null, p: chiSquareUpperTail(Q, m), kind: 'chisq' as const };
  };
  return { tau2, beta: fit.beta, cov, dfResid, coefficients, test };
}

/**
 * Mixed-effects meta-regression on one or several moderators (continuous, or categorical with dummy coding):
 * fitMixedModel on [1, moderator columns], τ²_res by the method of moments, REML or PM (Raudenbush 2009;
 * Viechtbauer 2005); Wald z tests for each coefficient and the omnibus Q_M (χ² on the number of moderator
 * coefficients), or with `hksj` Knapp & Hartung (2003) t tests on k − p df and an F test for Q_M; Q_E on k − p
 * df; and the proportion of τ² explained R² = max(0, (τ²_total − τ²_res)/τ²_total), τ²_total of the
 * intercept-only model by the same estimator (Raudenbush 2009).
 * Input: as pool plus `moderator` (one column) or `moderators` ([{ name, values, reference? }]); needs more
 * effects than coefficients and columns that can be estimated together.
 * Example: metaRegression({ effects: [0, 1, 2, 3], variances: [1, 1, 1, 1], moderator: [0, 1, 2, 3], method: 'FE' }).slope = 1.
 */
export function metaRegression(input: MetaRegressionInput): MetaRegressionResult {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object');
  const { y, v } = prepareData(input.effects, input.variances, 3);
  const k = y.length;
  const method: ResidualMethod = input.method === 'DL' || input.method === undefined ? 'MM' : input.method;
  if (!['FE', 'MM', 'REML', 'PM'].includes(method)) throw new StatsInputError('method must be one of FE, MM (DL), REML, PM', 'method');
  const level = input.level ?? 0.95;
  if (typeof level !== 'number' || !(level > 0 && level < 1)) throw new StatsInputError('level must be strictly between 0 and 1', 'level');
  const hksj = input.hksj ?? false;
  if (typeof hksj !== 'boolean') throw new StatsInputError('hksj must be true or false', 'hksj');

  const single = input.moderators === undefined;
  let columns: ModeratorColumn[];
  let labels: string[];
  if (single) {
    if (input.moderator === undefined) throw new StatsInputError('give a moderator or moderators', 'moderator');
    columns = [{ name: 'moderator', values: input.moderator }];
    labels = ['moderator'];
  } else {
    if (!Array.isArray(input.moderators) || input.moderators.length === 0)
      throw new StatsInputError('moderators must be a non-empty list of { name, values }', 'moderators');
    columns = input.moderators;
    labels = columns.map((c, j) => {
      if (!c || typeof c !== 'object' || typeof c.name !== 'string' || c.name === '') throw new StatsInputError(`moderators[${j}] needs a name`, 'moderators');
      return `moderators[${j}] (${c.name})`;
    });
    const seen = new Set<string>();
    for (const c of columns) {
      if (seen.has(c.name)) throw new StatsInputError(`moderator ${JSON.stringify(c.name)} is given twice`, 'moderators');
      seen.add(c.name);
    }
  }
  const design = buildDesign(columns, k, labels);
  const p = design.p;
  if (single && design.moderators[0].type === 'continuous') design.names[1] = 'slope';
  if (single && design.moderators[0].type === 'categorical') for (let a = 1; a < p; a++) design.names[a] = design.moderators[0].levels![a];
  if (k <= p) throw new StatsInputError(`meta-regression needs more effects than coefficients (${p})`, 'effects');

  const model = fitMixedModel(y, v, design, method, hksj, level);
  const tau2Total = residualTau2(y, v, new Float64Array(k).fill(1), 1, method);
  const fe = weightedRegression(y, v, design.X, p, 0)!;
  const qm = model.test(Array.from({ length: p - 1 }, (_, a) => a + 1));
  const types = new Set(design.moderators.map((m) => m.type));
  const continuousSingle = single && design.moderators[0].type === 'continuous';
  return {
    k,
    method,
    hksj,
    level,
    moderator_type: types.size > 1 ? 'mixed' : design.moderators[0].type,
    levels: single && design.moderators[0].type === 'categorical' ? design.moderators[0].levels : null,
    moderators: design.moderators,
    coefficients: model.coefficients,
    slope: continuousSingle ? model.coefficients[1].estimate : null,
    slope_se: continuousSingle ? model.coefficients[1].se : null,
    slope_p: continuousSingle ? model.coefficients[1].p : null,
    tau2: model.tau2,
    tau2_total: tau2Total,
    R2: tau2Total > 0 ? Math.max(0, (tau2Total - model.tau2) / tau2Total) : null,
    QM: qm.statistic,
    QM_df: qm.df,
    QM_df2: qm.df2,
    QM_test: qm.kind,
    QM_p: qm.p,
    QE: fe.Qres,
    QE_df: k - p,
    QE_p: chiSquareUpperTail(fe.Qres, k - p),
    few_effects_per_covariate: k < 10 * (p - 1),
  };
}
