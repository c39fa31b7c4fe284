import { StatsInputError } from './errors.js';
import type { PoolInput } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { makeEntry, type SensitivityEntry } from './sensitivity-entry.js';
import { normalQuantileUpper } from './normal.js';
import { tQuantileUpper } from './student-t.js';
import { dlTau2 } from './dl-tau2.js';

const SERIES_RATIO = 0.1;
const TERMS = 17; // 0.1^17 = 1e-17

/**
 * Cumulative meta-analysis in the order given (sort by year first for "cumulative by year"): entry m
 * pools studies 0 … m with the same method, HKSJ setting and level as `pool` (entry 0 is the single
 * first study, heterogeneity null).
 *
 * For FE and DL it uses running sums: the fixed-effect sums and DL's τ²ₘ are prefix sums; the
 * random-effects sums Σⱼ≤ₘ 1/(vⱼ + τ²ₘ) come from running power-series moments around an anchor τₐ²
 * (1/(v + τₐ² + δ) = Σₙ (−δ)ⁿ/(v + τₐ²)ⁿ⁺¹, 17 terms, used while |δ|·max w ≤ 0.1, error ≈ 1e-17); when
 * τ²ₘ drifts too far the anchor moves to τ²ₘ and the moments are rebuilt. REML and PM refit each prefix.
 *
 * Input: as pool, k ≥ 1. Example: cumulative({ effects: [0, 1], variances: [1, 1], method: 'FE' })[1].estimate = 0.5.
 */
export function cumulative(input: PoolInput): SensitivityEntry[] {
  const prepared = preparePoolInput(input);
  const { y, v, method, hksj, level } = prepared;
  const k = y.length;
  if (k < 1) throw new StatsInputError('cumulative analysis needs at least 1 effect', 'effects');
  const alpha = 1 - level;
  const out: SensitivityEntry[] = new Array(k);
  const zCrit = normalQuantileUpper(alpha / 2);

  if (method === 'REML' || method === 'PM') {
    for (let m = 0; m < k; m++) {
      const r = poolCore({ y: y.subarray(0, m + 1), v: v.subarray(0, m + 1) }, prepared, { lean: true, noWeights: true });
      out[m] = { index: m, k: r.k, estimate: r.estimate, se: r.se, ci_lower: r.ci_lower, ci_upper: r.ci_upper,
        statistic_df: r.statistic_df, tau2: r.tau2, I2: r.I2, I2_tau: r.I2_tau, Q: r.Q };
    }
    return out;
  }

  const center = dlTau2(y, v).feMean;
  const { tau2s, Qs } = cumulativeFixed(y, v, center, method === 'DL');
  const re = cumulativeRandom(y, v, center, tau2s, hksj);
  for (let m = 0; m < k; m++) {
    const n = m + 1;
    let se = Math.sqrt(1 / re.sumW[m]);
    let crit = zCrit;
    let statisticDf: number | null = null;
    if (hksj && n > 1) {
      statisticDf = n - 1;
      se = Math.sqrt(re.hksjNum[m] / ((n - 1) * re.sumW[m]));
      crit = tQuantileUpper(alpha / 2, statisticDf);
    }
    out[m] = makeEntry(m, n, method, center + re.mean[m], se, crit, statisticDf, tau2s[m], Qs[m]);
  }
  return out;
}

/** Prefix fixed-effect Q and DL τ² (each loop in its own function so V8 optimizes it with full type feedback). */
function cumulativeFixed(y: Float64Array, v: Float64Array, center: number, dl: boolean) {
  const k = y.length;
  const tau2s = new Float64Array(k);
  const Qs = new Float64Array(k);
  let A = 0, B = 0, C = 0, D = 0;
  for (let m = 0; m < k; m++) {
    const w = 1 / v[m];
    const d = y[m] - center;
    A += w; B += w * d; C += w * d * d; D += w * w;
    const n = m + 1;
    const Q = n > 1 ? Math.max(0, C - (B * B) / A) : 0;
    Qs[m] = Q;
    const c = A - D / A;
    tau2s[m] = dl && n > 1 && c > 0 ? Math.max(0, (Q - (n - 1)) / c) : 0;
  }
  return { tau2s, Qs };
}

/** Adds study j's power-series moments around `anchor` to mom; returns 1/(v_j + anchor). */
function addMoments(mom: Float64Array, yj: number, vj: number, center: number, anchor: number): number {
  const wa = 1 / (vj + anchor);
  const d = yj - center;
  let p = wa;
  for (let t = 0; t < TERMS; t++) {
    mom[3 * t] += p;
    mom[3 * t + 1] += p * d;
    mom[3 * t + 2] += p * d * d;
    p *= wa;
  }
  return wa;
}

function cumulativeRandom(y: Float64Array, v: Float64Array, center: number, tau2s: Float64Array, hksj: boolean) {
  const k = y.length;
  const sumW = new Float64Array(k), mean = new Float64Array(k), hksjNum = new Float64Array(k);
  const mom = new Float64Array(3 * TERMS);
  let anchor = 0;
  let wMax = 0;
  for (let m = 0; m < k; m++) {
    const wa = addMoments(mom, y[m], v[m], center, anchor);
    if (wa > wMax) wMax = wa;
    let delta = tau2s[m] - anchor;
    if (Math.abs(delta) * wMax > SERIES_RATIO) {
      anchor = tau2s[m];
      delta = 0;
      mom.fill(0);
      wMax = 0;
      for (let j = 0; j <= m; j++) {
        const w = addMoments(mom, y[j], v[j], center, anchor);
        if (w > wMax) wMax = w;
      }
    }
    let S0 = mom[0], S1 = mom[1], S2 = mom[2];
    if (delta !== 0) {
      let f = 1;
      for (let t = 1; t < TERMS; t++) {
        f *= -delta;
        S0 += f * mom[3 * t];
        S1 += f * mom[3 * t + 1];
        S2 += f * mom[3 * t + 2];
      }
    }
    sumW[m] = S0;
    const mu = S1 / S0;
    mean[m] = mu;
    if (hksj) hksjNum[m] = Math.max(0, S2 - S1 * mu);
  }
  return { sumW, mean, hksjNum };
}
