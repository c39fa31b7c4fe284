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
  p: number;
}

/**
 * Begg & Mazumdar's (1994) rank correlation test for funnel-plot asymmetry: Kendall's tau between
 * tᵢ = (yᵢ − μ̂_FE)/√(vᵢ − 1/Σw) and vᵢ, with z = S/√Var(S) (variance with the usual corrections for
 * ties, Kendall 1970) and a two-tailed normal p. Null for k < 3. O(k²) pairs.
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
  return { k, tau: S / denom, S, z, p: normalTwoTailed(z) };
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
