import { StatsInputError } from './errors.js';
import type { PoolInput } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { makeEntry, type SensitivityEntry } from './sensitivity-entry.js';
import { normalQuantileUpper } from './normal.js';
import { tQuantileUpper } from './student-t.js';
import { dlTau2 } from './dl-tau2.js';

/** Largest ratio |δ|·max w for which the series for Σ 1/(vⱼ + τ₀² + δ) is used, and the terms it then needs for < 1e-17. */
const SERIES_RATIO = 0.1;

/**
 * Leave-one-out sensitivity analysis: the analysis refitted k times, each time without study i
 * (i = 0 … k − 1), with the same method, HKSJ setting and level as `pool`.
 *
 * For FE and DL it runs in O(k) overall: the fixed-effect sums without study i come from prefix and
 * suffix sums (no subtraction of large totals), DL's τ²₋ᵢ follows from them, and the random-effects
 * sums Σⱼ≠ᵢ 1/(vⱼ + τ²₋ᵢ) (and the y-weighted ones) from a power series in δᵢ = τ²₋ᵢ − τ₀² around the
 * full-data τ₀², 1/(v + τ₀² + δ) = Σₙ (−δ)ⁿ/(v + τ₀²)ⁿ⁺¹, truncated where its error is below 1e-17;
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
        statistic: r.statistic, statistic_df: r.statistic_df, tau2: r.tau2, I2: r.I2, H2: r.H2, Q: r.Q };
    }
    return out;
  }

  const n = k - 1; // studies in each refit
  const statisticDf = hksj && n > 1 ? n - 1 : null;
  const crit = statisticDf === null ? normalQuantileUpper(alpha / 2) : tQuantileUpper(alpha / 2, statisticDf);
  const center = dlTau2(y, v).feMean;

  const { tau2s, Qs } = leaveOneOutFixed(y, v, center, method === 'DL', n);
  const tau0 = method === 'DL' ? dlTau2(y, v).tau2 : 0;
  const re = leaveOneOutRandom(y, v, center, tau0, tau2s, statisticDf !== null);
  for (let i = 0; i < k; i++) {
    const se = statisticDf !== null ? Math.sqrt(re.hksjNum[i] / ((n - 1) * re.sumW[i])) : Math.sqrt(1 / re.sumW[i]);
    out[i] = makeEntry(i, n, method, center + re.mean[i], se, crit, statisticDf, tau2s[i], Qs[i]);
  }
  return out;
}

/** Fixed-effect Q and DL τ² without each study, from prefix and suffix sums (separate function so V8 optimizes each loop with full type feedback). */
function leaveOneOutFixed(y: Float64Array, v: Float64Array, center: number, dl: boolean, n: number) {
  const k = y.length;
  const pA = new Float64Array(k + 1), pB = new Float64Array(k + 1), pC = new Float64Array(k + 1), pD = new Float64Array(k + 1);
  for (let j = 0; j < k; j++) {
    const w = 1 / v[j];
    const d = y[j] - center;
    pA[j + 1] = pA[j] + w;
    pB[j + 1] = pB[j] + w * d;
    pC[j + 1] = pC[j] + w * d * d;
    pD[j + 1] = pD[j] + w * w;
  }
  const tau2s = new Float64Array(k);
  const Qs = new Float64Array(k);
  let sA = 0, sB = 0, sC = 0, sD = 0;
  for (let i = k - 1; i >= 0; i--) {
    const A = pA[i] + sA, B = pB[i] + sB, C = pC[i] + sC, D = pD[i] + sD;
    const Q = n > 1 ? Math.max(0, C - (B * B) / A) : 0;
    Qs[i] = Q;
    const c = A - D / A;
    tau2s[i] = dl && n > 1 && c > 0 ? Math.max(0, (Q - (n - 1)) / c) : 0;
    const w = 1 / v[i];
    const d = y[i] - center;
    sA += w; sB += w * d; sC += w * d * d; sD += w * w;
  }
  return { tau2s, Qs };
}

/**
 * Σⱼ≠ᵢ wⱼ, Σⱼ≠ᵢ wⱼdⱼ / Σⱼ≠ᵢ wⱼ and the HKSJ numerator Σⱼ≠ᵢ wⱼ(dⱼ − m)², wⱼ = 1/(vⱼ + τ²₋ᵢ), dⱼ = yⱼ − center,
 * by the power series around tau0 (leading terms from prefix/suffix sums, higher ones from totals
 * minus the own term, whose rounding is damped by the series ratio).
 */
function leaveOneOutRandom(y: Float64Array, v: Float64Array, center: number, tau0: number, tau2s: Float64Array, hksj: boolean) {
  const k = y.length;
  let vmin = Infinity;
  for (let j = 0; j < k; j++) if (v[j] < vmin) vmin = v[j];
  const wMax = 1 / (vmin + tau0);
  let rMax = 0;
  for (let i = 0; i < k; i++) {
    const r = Math.abs(tau2s[i] - tau0) * wMax;
    if (r <= SERIES_RATIO && r > rMax) rMax = r;
  }
  const terms = rMax === 0 ? 1 : Math.max(1, Math.ceil(Math.log(1e-17) / Math.log(rMax)));
  const M0 = new Float64Array(k + 1), M1 = new Float64Array(k + 1), M2 = new Float64Array(k + 1);
  const mom = seriesMoments(y, v, center, tau0, terms, M0, M1, M2);
  const sumW = new Float64Array(k), mean = new Float64Array(k), hksjNum = new Float64Array(k);
  let s0 = 0, s1 = 0, s2 = 0;
  for (let i = k - 1; i >= 0; i--) {
    const delta = tau2s[i] - tau0;
    const wa = 1 / (v[i] + tau0);
    const di = y[i] - center;
    let S0: number, S1: number, S2: number;
    if (Math.abs(delta) * wMax <= SERIES_RATIO) {
      S0 = M0[i] + s0; S1 = M1[i] + s1; S2 = M2[i] + s2;
      let f = 1;
      let own = wa;
      for (let t = 1; t < terms; t++) {
        f *= -delta;
        own *= wa;
        S0 += f * (mom[3 * t] - own);
        S1 += f * (mom[3 * t + 1] - own * di);
        S2 += f * (mom[3 * t + 2] - own * di * di);
      }
    } else {
      const direct = directSums(y, v, center, tau2s[i], i);
      S0 = direct[0]; S1 = direct[1]; S2 = direct[2];
    }
    sumW[i] = S0;
    const m = S1 / S0;
    mean[i] = m;
    if (hksj) hksjNum[i] = Math.max(0, S2 - S1 * m);
    s0 += wa; s1 += wa * di; s2 += wa * di * di;
  }
  return { sumW, mean, hksjNum };
}

/** Running prefix sums of the leading series term (into M0–M2) and totals of the higher ones. */
function seriesMoments(y: Float64Array, v: Float64Array, center: number, tau0: number, terms: number,
  M0: Float64Array, M1: Float64Array, M2: Float64Array): Float64Array {
  const k = y.length;
  const mom = new Float64Array(3 * terms);
  for (let j = 0; j < k; j++) {
    const wa = 1 / (v[j] + tau0);
    const d = y[j] - center;
    M0[j + 1] = M0[j] + wa;
    M1[j + 1] = M1[j] + wa * d;
    M2[j + 1] = M2[j] + wa * d * d;
    let p = wa;
    for (let t = 1; t < terms; t++) {
      p *= wa;
      mom[3 * t] += p;
      mom[3 * t + 1] += p * d;
      mom[3 * t + 2] += p * d * d;
    }
  }
  return mom;
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
