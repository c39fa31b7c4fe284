// The one place the synthesis pipeline reaches into the statistics engine (shared/stats).
export { pool } from '../stats/pool.js';
export { leaveOneOut } from '../stats/leave-one-out.js';
export { cumulative } from '../stats/cumulative.js';
export { trimFill } from '../stats/trim-fill.js';
export { metaRegression } from '../stats/meta-regression.js';
export type { PoolResult, Method } from '../stats/types.js';

/**
 * Within-study composite of m correlated effects with one assumed correlation r between every pair
 * (Borenstein et al. 2009, ch. 24): mean of the effects, variance (1/m)²(Σvᵢ + Σᵢ≠ⱼ r√(vᵢvⱼ)).
 * Kept here until shared/stats exports its own; swap the import when it lands.
 */
export function aggregateWithinStudy(effects: number[], variances: number[], r: number): { effect: number; variance: number } {
  const m = effects.length;
  let sumY = 0;
  let sumV = 0;
  let sumSd = 0;
  for (let i = 0; i < m; i++) {
    sumY += effects[i];
    sumV += variances[i];
    sumSd += Math.sqrt(variances[i]);
  }
  // Σᵢ≠ⱼ √(vᵢvⱼ) = (Σ√vᵢ)² − Σvᵢ
  const cross = r * (sumSd * sumSd - sumV);
  return { effect: sumY / m, variance: (sumV + cross) / (m * m) };
}
