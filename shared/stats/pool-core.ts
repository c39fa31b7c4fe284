import type { PoolOptions, PoolResult, PreparedData } from './types.js';
import { dlTau2 } from './dl-tau2.js';
import { remlTau2 } from './reml-tau2.js';
import { generalizedQ, solveGeneralizedQ } from './generalized-q.js';
import { eggerFromSums } from './egger-core.js';
import { randomEffectsMoments, seriesQ } from './random-effects-moments.js';
import { chiSquareQuantile, chiSquareUpperTail } from './chi-square.js';
import { normalQuantileUpper, normalTwoTailed } from './normal.js';
import { tQuantileUpper, tTwoTailed } from './student-t.js';
import { assertFinite, StatsRangeError } from './errors.js';

export interface PoolCoreExtras {
  /** skip the Q-profile interval and Egger's test (used by trim-and-fill's inner fits) */
  lean?: boolean;
  /** skip the per-study weights array */
  noWeights?: boolean;
  /** use this τ² instead of estimating one (random-effects methods; subgroups with a pooled τ²) */
  tau2?: number;
}

/**
 * The pooled analysis on validated data (see pool.ts for the definitions and sources).
 */
export function poolCore(data: PreparedData, options: PoolOptions, extras: PoolCoreExtras = {}): PoolResult {
  const { y, v } = data;
  const { method, hksj, level } = options;
  const k = y.length;
  const alpha = 1 - level;
  const zCrit = normalQuantileUpper(alpha / 2);

  if (k === 1) {
    const se = Math.sqrt(v[0]);
    const z = y[0] / se;
    assertFinite({ 'the z statistic': z });
    return {
      k, method, hksj, level,
      estimate: y[0], se, ci_lower: y[0] - zCrit * se, ci_upper: y[0] + zCrit * se,
      statistic: z, statistic_df: null, p: normalTwoTailed(z),
      tau2: null, tau: null, tau2_ci_lower: null, tau2_ci_upper: null,
      Q: null, Q_df: null, Q_p: null, I2: null, I2_tau: null, H2: null,
      pi_lower: null, pi_upper: null, egger: null, weights: [100],
    };
  }

  const fe = dlTau2(y, v, !extras.lean);
  assertFinite({ 'the sum of inverse-variance weights': fe.sumW, 'the fixed-effect mean': fe.feMean, Q: fe.Q, 'the DerSimonian–Laird tau²': fe.tau2 });
  const df = k - 1;
  let tau2 = 0;
  if (extras.tau2 !== undefined && method !== 'FE') tau2 = extras.tau2;
  else if (method === 'DL') tau2 = fe.tau2;
  else if (method === 'PM') tau2 = solveGeneralizedQ(y, v, df, fe.tau2, fe.feMean, fe.Q);
  else if (method === 'REML') tau2 = remlTau2(y, v, fe.feMean);

  // pooled estimate with weights 1/(v + τ²); the random-effects pass also keeps the power-series moments
  // that give the generalized Q near τ̂² (HKSJ numerator, Q-profile bounds) without further passes
  let sumW: number;
  let mean: number;
  let hksjNumerator = 0;
  // raw weights go straight into the returned array and are scaled to percent at the end
  const wArr: number[] | null = extras.noWeights ? null : new Array<number>(k).fill(0);
  const isRandom = method !== 'FE';
  let moments: ReturnType<typeof randomEffectsMoments> | null = null;
  if (!isRandom) {
    sumW = fe.sumW;
    mean = fe.feMean;
    hksjNumerator = fe.Q;
    if (wArr) for (let i = 0; i < k; i++) wArr[i] = 1 / v[i];
  } else {
    moments = randomEffectsMoments(y, v, tau2, fe.feMean, 1 / (fe.vmin + tau2), wArr);
    const at = seriesQ(moments, tau2);
    if (!at) throw new StatsRangeError('the random-effects weights');
    sumW = at.sumW;
    mean = at.mean;
    hksjNumerator = at.Q;
  }
  const evaluate = (t: number) => (moments && seriesQ(moments, t)) || generalizedQ(y, v, t, fe.feMean);

  let se = Math.sqrt(1 / sumW);
  let crit = zCrit;
  let statisticDf: number | null = null;
  if (hksj) {
    se = Math.sqrt(hksjNumerator / (df * sumW));
    statisticDf = df;
    crit = tQuantileUpper(alpha / 2, df);
  }
  const statistic = mean / se;
  assertFinite({ 'the pooled estimate': mean, 'its standard error': se, 'tau²': tau2 });
  const p = statisticDf === null ? normalTwoTailed(statistic) : tTwoTailed(statistic, statisticDf);

  const Q = fe.Q;
  const I2 = Q > 0 ? 100 * Math.max(0, (Q - df) / Q) : 0;
  const H2 = Q / df;

  let tau2Lower: number | null = null;
  let tau2Upper: number | null = null;
  if (isRandom && !extras.lean) {
    // Q-profile interval (Viechtbauer 2007): the τ² where the generalized Q meets the χ²(k−1) quantiles
    const qHi = chiSquareQuantile(alpha / 2, df, true);
    const qLo = chiSquareQuantile(alpha / 2, df, false);
    tau2Lower = solveGeneralizedQ(y, v, qHi, tau2, fe.feMean, Q, evaluate);
    tau2Upper = solveGeneralizedQ(y, v, qLo, Math.max(tau2, tau2Lower), fe.feMean, Q, evaluate);
  }

  let I2tau: number | null = null;
  if (method === 'REML' || method === 'PM') {
    // typical within-study variance (Higgins & Thompson 2002): (k − 1)Σw / ((Σw)² − Σw²)
    const s2 = (df * fe.sumW) / (fe.sumW * fe.sumW - fe.sumW2);
    I2tau = (100 * tau2) / (tau2 + s2);
  }

  let piLower: number | null = null;
  let piUpper: number | null = null;
  if (isRandom && k >= 3) {
    const half = tQuantileUpper(alpha / 2, k - 2) * Math.sqrt(tau2 + se * se);
    piLower = mean - half;
    piUpper = mean + half;
  }

  const weights: number[] = wArr ?? [];
  if (wArr) {
    const scale = 100 / sumW;
    for (let i = 0; i < k; i++) wArr[i] *= scale;
  }

  return {
    k, method, hksj, level,
    estimate: mean, se, ci_lower: mean - crit * se, ci_upper: mean + crit * se,
    statistic, statistic_df: statisticDf, p,
    tau2: isRandom ? tau2 : null,
    tau: isRandom ? Math.sqrt(tau2) : null,
    tau2_ci_lower: tau2Lower, tau2_ci_upper: tau2Upper,
    Q, Q_df: df, Q_p: chiSquareUpperTail(Q, df), I2, I2_tau: I2tau, H2,
    pi_lower: piLower, pi_upper: piUpper,
    egger: fe.egger ? eggerFromSums(fe.egger, k) : null,
    weights,
  };
}
