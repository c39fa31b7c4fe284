import { StatsInputError } from './errors.js';
import type { PoolInput } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { residualTau2, type ResidualMethod } from './residual-tau2.js';
import { weightedRegression } from './weighted-regression.js';

export type TrimFillSide = 'left' | 'right';

export interface TrimFillInput extends PoolInput {
  /** the side on which studies are missing; estimated when absent */
  side?: TrimFillSide;
}

export interface TrimFillResult {
  k0: number;
  side: TrimFillSide;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  tau2: number | null;
  filled: { effect: number; variance: number }[];
}

const REGRESSION_METHOD: Record<string, ResidualMethod> = { FE: 'FE', DL: 'MM', REML: 'REML', PM: 'PM' };

/**
 * Trim-and-fill (Duval & Tweedie 2000) with the L0 estimator, L0 = (4·Sᵣ − n(n + 1))/(2n − 1).
 * Conventions:
 * - side (where studies are missing), unless given: the sign of the slope of a weighted regression of
 *   the effects on their SEs, weights 1/(vᵢ + τ²_res), τ²_res by the analysis' own estimator (DL → method
 *   of moments); a negative slope puts the missing studies on the right, otherwise on the left;
 * - the effects are oriented so that missing studies are on the left; each round re-fits the centre with
 *   the analysis' estimator on the n − k0 studies kept (the k0 largest oriented effects trimmed), ranks
 *   |yᵢ − centre| over all n studies (ties in ascending order of the oriented effect), Sᵣ sums the ranks
 *   of the studies above the centre (a study exactly at the centre adds nothing), and
 *   k0 = max(0, round(L0)); rounds repeat until k0 no longer changes;
 * - each filled study is 2c − yᵢ of a trimmed study with its own variance, c the final centre;
 * - the adjusted result is the analysis' estimator on the data plus the filled studies (fully
 *   converged); with k0 = 0 it is the original analysis.
 * Input: as pool, k ≥ 3, optional side "left" | "right".
 */
export function trimFill(input: TrimFillInput): TrimFillResult {
  const prepared = preparePoolInput(input, 3);
  const { y, v } = prepared;
  const n = y.length;
  let side = input.side;
  if (side !== undefined && side !== 'left' && side !== 'right') throw new StatsInputError('side must be "left" or "right"', 'side');
  if (side === undefined) {
    const X = new Float64Array(2 * n);
    for (let i = 0; i < n; i++) {
      X[2 * i] = 1;
      X[2 * i + 1] = Math.sqrt(v[i]);
    }
    const method = REGRESSION_METHOD[prepared.method];
    const tau2 = residualTau2(y, v, X, 2, method);
    const fit = Number.isFinite(tau2) ? weightedRegression(y, v, X, 2, tau2) : null;
    side = fit && fit.beta[1] < 0 ? 'right' : 'left';
  }
  const sign = side === 'left' ? 1 : -1;
  const yo = new Float64Array(n);
  for (let i = 0; i < n; i++) yo[i] = sign * y[i];
  // ascending oriented effect, ties by position (stable)
  const order = Array.from({ length: n }, (_, i) => i).sort((a, b) => yo[a] - yo[b] || a - b);

  const centreFor = (trim: number): number => {
    const kept = n - trim;
    const ys = new Float64Array(kept);
    const vs = new Float64Array(kept);
    for (let j = 0; j < kept; j++) {
      ys[j] = yo[order[j]];
      vs[j] = v[order[j]];
    }
    return poolCore({ y: ys, v: vs }, prepared, { lean: true, noWeights: true }).estimate;
  };
  let k0 = 0;
  let centre = centreFor(0);
  const seen = new Set<number>([0]);
  for (let round = 0; round < 1000; round++) {
    const dev = new Float64Array(n);
    for (let i = 0; i < n; i++) dev[i] = yo[i] - centre;
    const byAbs = Array.from({ length: n }, (_, i) => i).sort((a, b) => Math.abs(dev[a]) - Math.abs(dev[b]) || yo[a] - yo[b] || a - b);
    let sr = 0;
    for (let r = 0; r < n; r++) if (dev[byAbs[r]] > 0) sr += r + 1;
    const L0 = (4 * sr - n * (n + 1)) / (2 * n - 1);
    const next = Math.min(n - 1, Math.max(0, Math.round(L0)));
    if (next === k0) break;
    k0 = next;
    centre = centreFor(k0);
    // a cycle between values would never settle: stop at the first repeat
    if (seen.has(k0)) break;
    seen.add(k0);
  }

  if (k0 === 0) {
    const r = poolCore({ y, v }, prepared, { lean: true, noWeights: true });
    return { k0, side, estimate: r.estimate, se: r.se, ci_lower: r.ci_lower, ci_upper: r.ci_upper, tau2: r.tau2, filled: [] };
  }
  const filled: { effect: number; variance: number }[] = [];
  for (let j = n - k0; j < n; j++) {
    const i = order[j];
    filled.push({ effect: sign * (2 * centre - yo[i]), variance: v[i] });
  }
  const ya = new Float64Array(n + k0);
  const va = new Float64Array(n + k0);
  ya.set(y);
  va.set(v);
  filled.forEach((f, j) => {
    ya[n + j] = f.effect;
    va[n + j] = f.variance;
  });
  const r = poolCore({ y: ya, v: va }, prepared, { lean: true, noWeights: true });
  return { k0, side, estimate: r.estimate, se: r.se, ci_lower: r.ci_lower, ci_upper: r.ci_upper, tau2: r.tau2, filled };
}
