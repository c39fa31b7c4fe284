import { StatsInputError } from './errors.js';
import type { Method, PoolInput } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { makeEntry, type SensitivityEntry } from './sensitivity-entry.js';
import { normalQuantileUpper } from './normal.js';
import { tQuantileUpper } from './student-t.js';
import { dlTau2 } from './dl-tau2.js';
import { LEVELS, SERIES_LIMIT, randomEffectsMoments } from './random-effects-moments.js';


/**
 * Leave-one-out sensitivity analysis: the analysis refitted k times, each time without study i
 * (i = 0 … k − 1), with the same method, HKSJ setting and level as `pool`.
 *
 * For FE and DL it runs in O(k) overall: the fixed-effect sums without study i come from prefix and
 * suffix sums (no subtraction of large totals), DL's τ²₋ᵢ follows from them, and the random-effects
 * sums Σⱼ≠ᵢ 1/(vⱼ + τ²₋ᵢ) (and the y-weighted ones) from a power series in δᵢ = τ²₋ᵢ − τ₀² around the
 * full-data τ₀², 1/(v + τ₀² + δ) = Σₙ (−δ)ⁿ/(v + τ₀²)ⁿ⁺¹, with at most 9 terms while |δᵢ|·max w ≤ 0.01 (error below 1e-18);
 * a study whose δᵢ is too large for the series is refitted directly. REML and PM refit each subset.
 *
 * Input: as pool, k ≥ 2. Returns k entries (see SensitivityEntry), entry i omitting study i.
 * Example: leaveOneOut({ effects: [0, 1, 2], variances: [1, 1, 1], method: 'FE' })[0].estimate = 1.5.
 */
export function leaveOneOut(input: PoolInput): SensitivityEntry[] {
  const prepared = preparePoolInput(input);
  const { y, v, method, hksj, level } = prepared;
  const k = y.length;
  if (k < 2) throw new StatsInputError('leave-one-out needs at least 2 effects', 'effects');
  const alpha = 1 - level;
  const out: SensitivityEntry[] = new Array(k);

  if (method === 'REML' || method === 'PM') {
    const ys = new Float64Array(k - 1);
    const vs = new Float64Array(k - 1);
    for (let i = 0; i < k; i++) {
      for (let j = 0, m = 0; j < k; j++) if (j !== i) { ys[m] = y[j]; vs[m] = v[j]; m++; }
      const r = poolCore({ y: ys, v: vs }, prepared, { lean: true, noWeights: true });
      out[i] = { index: i, k: r.k, estimate: r.estimate, se: r.se, ci_lower: r.ci_lower, ci_upper: r.ci_upper,
        statistic_df: r.statistic_df, tau2: r.tau2, I2: r.I2, I2_tau: r.I2_tau, Q: r.Q };
    }
    return out;
  }

  const n = k - 1; // studies in each refit
  const statisticDf = hksj && n > 1 ? n - 1 : null;
  const crit = statisticDf === null ? normalQuantileUpper(alpha / 2) : tQuantileUpper(alpha / 2, statisticDf);
  leaveOneOutFast(y, v, method === 'DL', statisticDf, crit, method, out);
  return out;
}

/**
 * FE/DL leave-one-out in O(k): a forward pass stores prefix sums of the fixed-effect sums and of the
 * random-effects sums at τ₀² (the full-data DL value); one backward pass then forms, for each i, the
 * sums without study i (prefix + running suffix, no subtraction of large totals), DL's τ²₋ᵢ, and the
 * random-effects sums at τ²₋ᵢ from the power series around τ₀² (higher terms from the totals of
 * random-effects-moments.ts minus the own term, damped by the series ratio).
 */
function leaveOneOutFast(
  y: Float64Array, v: Float64Array, dl: boolean, statisticDf: number | null, crit: number, method: Method, out: SensitivityEntry[],
) {
  const k = y.length;
  const n = k - 1;
  const fe = dlTau2(y, v);
  const center = fe.feMean;
  const tau0 = dl ? fe.tau2 : 0;
  const wMax = 1 / (fe.vmin + tau0);
  const M = randomEffectsMoments(y, v, tau0, center, wMax, null).M;
  const pA = new Float64Array(k + 1), pB = new Float64Array(k + 1), pC = new Float64Array(k + 1), pD = new Float64Array(k + 1);
  const P0 = new Float64Array(k + 1), P1 = new Float64Array(k + 1), P2 = new Float64Array(k + 1);
  for (let j = 0; j < k; j++) {
    const w = 1 / v[j];
    const wa = 1 / (v[j] + tau0);
    const d = y[j] - center;
    pA[j + 1] = pA[j] + w;
    pB[j + 1] = pB[j] + w * d;
    pC[j + 1] = pC[j] + w * d * d;
    pD[j + 1] = pD[j] + w * w;
    P0[j + 1] = P0[j] + wa;
    P1[j + 1] = P1[j] + wa * d;
    P2[j + 1] = P2[j] + wa * d * d;
  }
  let sA = 0, sB = 0, sC = 0, sD = 0, s0 = 0, s1 = 0, s2 = 0;
  for (let i = k - 1; i >= 0; i--) {
    const A = pA[i] + sA, B = pB[i] + sB, C = pC[i] + sC, D = pD[i] + sD;
    const Q = n > 1 ? Math.max(0, C - (B * B) / A) : 0;
    const c = A - D / A;
    const tau2 = dl && n > 1 && c > 0 ? Math.max(0, (Q - (n - 1)) / c) : 0;
    const w = 1 / v[i];
    const wa = 1 / (v[i] + tau0);
    const di = y[i] - center;
    const x = -(tau2 - tau0) * wMax;
    let S0: number, S1: number, S2: number;
    if (Math.abs(x) <= SERIES_LIMIT) {
      S0 = P0[i] + s0; S1 = P1[i] + s1; S2 = P2[i] + s2;
      const u = wa / wMax;
      let f = 1;
      let own = wa;
      for (let t = 1; t < LEVELS; t++) {
        f *= x;
        if (Math.abs(f) < 1e-18) break;
        own *= u;
        S0 += f * (M[3 * t] - own);
        S1 += f * (M[3 * t + 1] - own * di);
        S2 += f * (M[3 * t + 2] - own * di * di);
      }
    } else {
      const direct = directSums(y, v, center, tau2, i);
      S0 = direct[0]; S1 = direct[1]; S2 = direct[2];
    }
    const m = S1 / S0;
    const se = statisticDf !== null ? Math.sqrt(Math.max(0, S2 - S1 * m) / ((n - 1) * S0)) : Math.sqrt(1 / S0);
    out[i] = makeEntry(i, n, method, center + m, se, crit, statisticDf, tau2, Q);
    sA += w; sB += w * di; sC += w * di * di; sD += w * w;
    s0 += wa; s1 += wa * di; s2 += wa * di * di;
  }
}

/** The random-effects sums without study `skip`, computed directly (when the series would converge too slowly). */
function directSums(y: Float64Array, v: Float64Array, center: number, tau2: number, skip: number): [number, number, number] {
  let S0 = 0, S1 = 0, S2 = 0;
  for (let j = 0; j < y.length; j++) {
    if (j === skip) continue;
    const w = 1 / (v[j] + tau2);
    const d = y[j] - center;
    S0 += w; S1 += w * d; S2 += w * d * d;
  }
  return [S0, S1, S2];
}
