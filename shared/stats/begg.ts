import { StatsInputError } from './errors.js';
import { prepareData } from './validate-input.js';
import { dlTau2 } from './dl-tau2.js';
import { normalTwoTailed } from './normal.js';
import type { NumericArray } from './types.js';

export interface BeggResult {
  k: number;
  /** Kendall's tau-b between the standardized effects and the variances */
  tau: number;
  /** S = concordant − discordant pairs */
  S: number;
  z: number;
  /** two-tailed p: exact (permutation distribution of Kendall's statistic) for k ≤ 50 without ties, else normal */
  p: number;
  p_method: 'exact' | 'normal';
}

/** Largest k for the exact p (above it, and with ties, the normal approximation). */
export const BEGG_EXACT_MAX_K = 50;

/**
 * Null distribution of the number of concordant pairs T for k untied pairs (the Mahonian numbers, counts of
 * permutations by inversions; Kendall 1970, ch. 4), as probabilities: f_m(t) = (1/m)·Σ_{j<m} f_{m−1}(t − j).
 */
const distributions = new Map<number, Float64Array>();

export function kendallDistribution(k: number): Float64Array {
  const cached = distributions.get(k);
  if (cached) return cached;
  const max = (k * (k - 1)) / 2;
  let f = new Float64Array(max + 1);
  f[0] = 1;
  for (let m = 2; m <= k; m++) {
    const top = (m * (m - 1)) / 2;
    const next = new Float64Array(max + 1);
    // direct sums of positive terms (a running window would subtract and lose the far tails)
    for (let t = 0; t <= top; t++) {
      let sum = 0;
      for (let j = Math.max(0, t - (top - m + 1)); j <= Math.min(t, m - 1); j++) sum += f[t - j];
      next[t] = sum / m;
    }
    f = next;
  }
  if (k <= BEGG_EXACT_MAX_K) distributions.set(k, f);
  return f;
}

/**
 * Two-tailed exact p of Kendall's statistic with T concordant pairs among k untied pairs: 2·P(T ≤ t) below the
 * centre, 2·P(T ≥ t) above it (the same convention as R's cor.test), capped at 1; each tail summed from its end.
 */
export function kendallExactP(concordant: number, k: number): number {
  const f = kendallDistribution(k);
  const max = (k * (k - 1)) / 2;
  let tail = 0;
  if (concordant > max / 2) for (let t = max; t >= concordant; t--) tail += f[t];
  else for (let t = 0; t <= concordant; t++) tail += f[t];
  return Math.min(1, 2 * tail);
}

/**
 * Begg & Mazumdar's (1994) rank correlation test for funnel-plot asymmetry: Kendall's tau between
 * tᵢ = (yᵢ − μ̂_FE)/√(vᵢ − 1/Σw) and vᵢ, with z = S/√Var(S) (variance with the usual corrections for
 * ties, Kendall 1970). The p is exact (kendallExactP) for k ≤ 50 without ties, else the two-tailed normal p of z.
 * Null for k < 3. O(k²) pairs.
 * Example: begg({ effects: [0.1, 0.2, 0.3, 0.4], variances: [0.01, 0.02, 0.03, 0.04] }).tau = 1.
 */
export function begg(input: { effects: NumericArray; variances: NumericArray }): BeggResult | null {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object with effects and variances');
  const { y, v } = prepareData(input.effects, input.variances);
  const k = y.length;
  if (k < 3) return null;
  const fe = dlTau2(y, v);
  const t = new Float64Array(k);
  for (let i = 0; i < k; i++) t[i] = (y[i] - fe.feMean) / Math.sqrt(v[i] - 1 / fe.sumW);
  let S = 0;
  for (let i = 0; i < k; i++) {
    for (let j = i + 1; j < k; j++) {
      const a = Math.sign(t[i] - t[j]);
      const b = Math.sign(v[i] - v[j]);
      S += a * b;
    }
  }
  const tiesT = tieCounts(t);
  const tiesV = tieCounts(v);
  const n0 = (k * (k - 1)) / 2;
  const n1 = tiesT.reduce((s, c) => s + (c * (c - 1)) / 2, 0);
  const n2 = tiesV.reduce((s, c) => s + (c * (c - 1)) / 2, 0);
  const denom = Math.sqrt((n0 - n1) * (n0 - n2));
  const sum = (ties: number[], f: (c: number) => number) => ties.reduce((s, c) => s + f(c), 0);
  const varS =
    (k * (k - 1) * (2 * k + 5) - sum(tiesT, (c) => c * (c - 1) * (2 * c + 5)) - sum(tiesV, (c) => c * (c - 1) * (2 * c + 5))) / 18 +
    (sum(tiesT, (c) => c * (c - 1) * (c - 2)) * sum(tiesV, (c) => c * (c - 1) * (c - 2))) / (9 * k * (k - 1) * (k - 2)) +
    (sum(tiesT, (c) => c * (c - 1)) * sum(tiesV, (c) => c * (c - 1))) / (2 * k * (k - 1));
  if (!(denom > 0) || !(varS > 0)) return null;
  const z = S / Math.sqrt(varS);
  const exact = k <= BEGG_EXACT_MAX_K && tiesT.length === 0 && tiesV.length === 0;
  const p = exact ? kendallExactP(Math.round((S + n0) / 2), k) : normalTwoTailed(z);
  return { k, tau: S / denom, S, z, p, p_method: exact ? 'exact' : 'normal' };
}

function tieCounts(x: Float64Array): number[] {
  const sorted = Float64Array.from(x).sort();
  const counts: number[] = [];
  let run = 1;
  for (let i = 1; i <= sorted.length; i++) {
    if (i < sorted.length && sorted[i] === sorted[i - 1]) run++;
    else {
      if (run > 1) counts.push(run);
      run = 1;
    }
  }
  return counts;
}
