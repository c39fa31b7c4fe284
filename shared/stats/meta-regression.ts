import { StatsInputError } from './errors.js';
import { prepareData } from './validate-input.js';
import { residualTau2, type ResidualMethod } from './residual-tau2.js';
import { weightedRegression } from './weighted-regression.js';
import { invertMatrix } from './small-matrix.js';
import { chiSquareUpperTail } from './chi-square.js';
import { normalQuantileUpper, normalTwoTailed } from './normal.js';
import type { NumericArray } from './types.js';

export interface MetaRegressionInput {
  effects: NumericArray;
  variances: NumericArray;
  /** one value per effect: numbers (continuous) or strings (categorical; first level in sorted order is the reference) */
  moderator: ArrayLike<number> | ArrayLike<string>;
  /** residual τ² estimator: "MM" (method of moments; "DL" is accepted for it), "REML", "PM" or "FE"; default "MM" */
  method?: ResidualMethod | 'DL';
  level?: number;
}

export interface RegressionCoefficient {
  name: string;
  estimate: number;
  se: number;
  z: number;
  p: number;
  ci_lower: number;
  ci_upper: number;
}

export interface MetaRegressionResult {
  k: number;
  method: ResidualMethod;
  level: number;
  moderator_type: 'continuous' | 'categorical';
  /** categorical: the levels, the first being the reference */
  levels: string[] | null;
  coefficients: RegressionCoefficient[];
  /** continuous moderator: the slope, its SE and p; null for categorical */
  slope: number | null;
  slope_se: number | null;
  slope_p: number | null;
  /** residual τ² with the moderator, and τ² of the intercept-only model by the same estimator */
  tau2: number;
  tau2_total: number;
  /** proportion of τ² explained, max(0, (τ²_total − τ²)/τ²_total); null when τ²_total = 0 */
  R2: number | null;
  /** omnibus test of the moderator coefficients (χ² on p − 1 df) */
  QM: number;
  QM_df: number;
  QM_p: number;
  /** residual heterogeneity Q_E on k − p df */
  QE: number;
  QE_df: number;
  QE_p: number;
}

/**
 * Mixed-effects meta-regression on one moderator (continuous or categorical): WLS of the effects on
 * [1, x] (or on an intercept and k−1 level indicators) with weights 1/(vᵢ + τ²_res), τ²_res by the
 * method of moments, REML or PM (Raudenbush 2009; Viechtbauer 2005); Wald z tests for each
 * coefficient, the omnibus Q_M, Q_E, and the proportion of τ² explained
 * R² = (τ²_total − τ²_res)/τ²_total (Raudenbush 2009).
 * Input: as pool plus `moderator`; needs k > p + 0 (more effects than coefficients) and a moderator that
 * varies. Example: metaRegression({ effects: [0, 1, 2, 3], variances: [1, 1, 1, 1], moderator: [0, 1, 2, 3], method: 'FE' }).slope = 1.
 */
export function metaRegression(input: MetaRegressionInput): MetaRegressionResult {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object');
  const { y, v } = prepareData(input.effects, input.variances, 3);
  const k = y.length;
  const method: ResidualMethod = input.method === 'DL' || input.method === undefined ? 'MM' : input.method;
  if (!['FE', 'MM', 'REML', 'PM'].includes(method)) throw new StatsInputError('method must be one of FE, MM (DL), REML, PM', 'method');
  const level = input.level ?? 0.95;
  if (typeof level !== 'number' || !(level > 0 && level < 1)) throw new StatsInputError('level must be strictly between 0 and 1', 'level');
  const mod = input.moderator as ArrayLike<unknown>;
  if (!mod || typeof mod !== 'object' || mod.length !== k)
    throw new StatsInputError(`moderator must have one value per effect (${k})`, 'moderator');
  const categorical = typeof mod[0] === 'string';
  let p: number;
  let X: Float64Array;
  let names: string[];
  let levels: string[] | null = null;
  if (categorical) {
    for (let i = 0; i < k; i++) if (typeof mod[i] !== 'string') throw new StatsInputError(`moderator[${i}] must be a string like the others`, 'moderator');
    levels = [...new Set(Array.from(mod as ArrayLike<string>))].sort();
    if (levels.length < 2) throw new StatsInputError('moderator must have at least 2 levels', 'moderator');
    p = levels.length;
    if (k <= p) throw new StatsInputError(`meta-regression needs more effects than coefficients (${p})`, 'effects');
    X = new Float64Array(k * p);
    const index = new Map(levels.map((l, i) => [l, i]));
    for (let i = 0; i < k; i++) {
      X[i * p] = 1;
      const li = index.get(mod[i] as string)!;
      if (li > 0) X[i * p + li] = 1;
    }
    names = ['intercept', ...levels.slice(1)];
  } else {
    p = 2;
    X = new Float64Array(k * 2);
    for (let i = 0; i < k; i++) {
      const x = mod[i];
      if (typeof x !== 'number' || !Number.isFinite(x)) throw new StatsInputError(`moderator[${i}] must be a finite number`, 'moderator');
      X[2 * i] = 1;
      X[2 * i + 1] = x;
    }
    names = ['intercept', 'slope'];
  }

  const tau2 = residualTau2(y, v, X, p, method);
  const fit = Number.isFinite(tau2) ? weightedRegression(y, v, X, p, tau2) : null;
  if (!fit) throw new StatsInputError('the moderator does not vary enough to be estimated (singular design)', 'moderator');
  const ones = new Float64Array(k).fill(1);
  const tau2Total = residualTau2(y, v, ones, 1, method);
  const fe = weightedRegression(y, v, X, p, 0)!;

  const crit = normalQuantileUpper((1 - level) / 2);
  const coefficients: RegressionCoefficient[] = names.map((name, a) => {
    const estimate = fit.beta[a];
    const se = Math.sqrt(fit.cov[a * p + a]);
    const z = estimate / se;
    return { name, estimate, se, z, p: normalTwoTailed(z), ci_lower: estimate - crit * se, ci_upper: estimate + crit * se };
  });

  // Q_M = b′V⁻¹b over the moderator coefficients
  const q = p - 1;
  const sub = new Float64Array(q * q);
  for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) sub[a * q + b] = fit.cov[(a + 1) * p + (b + 1)];
  const subInv = invertMatrix(sub, q);
  let QM = NaN;
  if (subInv) {
    QM = 0;
    for (let a = 0; a < q; a++) for (let b = 0; b < q; b++) QM += fit.beta[a + 1] * subInv[a * q + b] * fit.beta[b + 1];
  }
  const R2 = tau2Total > 0 ? Math.max(0, (tau2Total - tau2) / tau2Total) : null;
  return {
    k,
    method,
    level,
    moderator_type: categorical ? 'categorical' : 'continuous',
    levels,
    coefficients,
    slope: categorical ? null : coefficients[1].estimate,
    slope_se: categorical ? null : coefficients[1].se,
    slope_p: categorical ? null : coefficients[1].p,
    tau2,
    tau2_total: tau2Total,
    R2,
    QM,
    QM_df: q,
    QM_p: chiSquareUpperTail(QM, q),
    QE: fe.Qres,
    QE_df: k - p,
    QE_p: chiSquareUpperTail(fe.Qres, k - p),
  };
}
