import { chiSquareUpperTail } from './chi-square.js';
import { normalQuantileUpper, normalTwoTailed } from './normal.js';
import { tQuantileUpper, tTwoTailed } from './student-t.js';
import { prepareMultilevel, type ClusteredData, type MultilevelInput } from './multilevel-input.js';
import { fitMultilevelReml, type RemlFit } from './multilevel-reml.js';

export interface MultilevelCoefficient {
  estimate: number;
  se: number;
  statistic: number;
  p: number;
  ci_lower: number;
  ci_upper: number;
  /** k − p, with test = "t" only */
  df?: number;
}

export interface MultilevelResult {
  k: number;
  clusters: number;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  statistic: number;
  /** k − p for test "t", null for "z" */
  statistic_df: number | null;
  p: number;
  sigma2_between: number;
  sigma2_within: number;
  Q: number;
  Q_df: number;
  Q_p: number;
  /** percent */
  I2_between: number;
  I2_within: number;
  pi_lower: number;
  pi_upper: number;
  /** restricted log-likelihood at the optimum */
  loglik: number;
  /** intercept first; present when moderators were given */
  coefficients?: MultilevelCoefficient[];
}

/** A fitted model shared by poolMultilevel and robustPool. */
export interface MultilevelFit {
  d: ClusteredData;
  reml: RemlFit;
  /** coefficients of the unshifted effects */
  beta: Float64Array;
  vcov: Float64Array;
}

export function fitMultilevel(d: ClusteredData): MultilevelFit {
  const reml = fitMultilevelReml(d);
  const beta = Float64Array.from(reml.at.beta);
  beta[0] += d.shift;
  return { d, reml, beta, vcov: reml.at.vcov };
}

/**
 * Three-level random-effects model: y_ij = μ + x_ijᵀβ + u_j + e_ij + ε_ij with u_j ~ N(0, σ²_between) for
 * cluster (paper) j, e_ij ~ N(0, σ²_within) for effect i in it and ε_ij ~ N(0, v_ij) known (Konstantopoulos
 * 2011; Cheung 2014), σ² by REML to the exact optimum on σ² ≥ 0 (see multilevel-reml.ts).
 * - Wald tests and intervals use z, or t with k − p df when test = "t".
 * - Q is the residual heterogeneity statistic Σ(y − Xβ̂_FE)²/v on k − p df (Cochran 1954).
 * - I²_between = σ²_b/(σ²_b + σ²_w + ṽ), I²_within likewise (Cheung 2014, eq. 14), with the typical
 *   within-study variance ṽ = (k − 1)Σw/((Σw)² − Σw²), w = 1/v (Higgins & Thompson 2002), in percent.
 * - Prediction interval (at moderators = 0): estimate ± crit·√(se² + σ²_b + σ²_w).
 * - When every cluster holds one effect only σ²_b + σ²_w is identified; it is reported split half and half.
 */
export function poolMultilevel(input: MultilevelInput): MultilevelResult {
  const d = prepareMultilevel(input, 'poolMultilevel');
  return summariseMultilevel(fitMultilevel(d));
}

/** The reported fields of a fitted model. */
export function summariseMultilevel(fit: MultilevelFit): MultilevelResult {
  const { d, reml, beta, vcov } = fit;
  const { k, p, v, level, test } = d;
  const df = k - p;
  const alpha = (1 - level) / 2;
  const crit = test === 't' ? tQuantileUpper(alpha, df) : normalQuantileUpper(alpha);
  const twoTailed = (z: number) => (test === 't' ? tTwoTailed(z, df) : normalTwoTailed(z));
  const coefficients: MultilevelCoefficient[] = [];
  for (let a = 0; a < p; a++) {
    const estimate = beta[a];
    const se = Math.sqrt(vcov[a * p + a]);
    const statistic = estimate / se;
    const c: MultilevelCoefficient = { estimate, se, statistic, p: twoTailed(statistic), ci_lower: estimate - crit * se, ci_upper: estimate + crit * se };
    if (test === 't') c.df = df;
    coefficients.push(c);
  }
  const Q = reml.Q;
  let sw1 = 0, sw2 = 0;
  for (let i = 0; i < k; i++) {
    sw1 += 1 / v[i];
    sw2 += 1 / (v[i] * v[i]);
  }
  const typicalV = ((k - 1) * sw1) / (sw1 * sw1 - sw2);
  const sb = reml.sigma2Between;
  const sw = reml.sigma2Within;
  const total = sb + sw + typicalV;
  const c0 = coefficients[0];
  const piHalf = crit * Math.sqrt(c0.se * c0.se + sb + sw);
  const result: MultilevelResult = {
    k,
    clusters: d.clusters,
    estimate: c0.estimate,
    se: c0.se,
    ci_lower: c0.ci_lower,
    ci_upper: c0.ci_upper,
    statistic: c0.statistic,
    statistic_df: test === 't' ? df : null,
    p: c0.p,
    sigma2_between: sb,
    sigma2_within: sw,
    Q,
    Q_df: df,
    Q_p: Q > 0 ? chiSquareUpperTail(Q, df) : 1,
    I2_between: (100 * sb) / total,
    I2_within: (100 * sw) / total,
    pi_lower: c0.estimate - piHalf,
    pi_upper: c0.estimate + piHalf,
    loglik: reml.at.ll,
  };
  if (d.withModerators) result.coefficients = coefficients;
  return result;
}
