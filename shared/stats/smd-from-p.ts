import { StatsInputError } from './errors.js';
import { direction, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesGFromD } from './smd-independent.js';
import { tQuantileUpper } from './student-t.js';

/**
 * Hedges' g from a two-tailed p of an independent-samples t test: |t| = t⁻¹(1 − p/2; n1 + n2 − 2),
 * sign from the stated direction, then as from t (Borenstein et al. 2009, ch. 7). Input: 0 < p < 1.
 * Example: smdFromP(0.05, 20, 20, 1) → |t| = 2.024394164, d ≈ 0.6402.
 */
export function smdFromP(p: number, n1: number, n2: number, dir: 1 | -1): EffectSize {
  if (typeof p !== 'number' || !(p > 0 && p < 1)) throw new StatsInputError('p must be strictly between 0 and 1', 'p');
  sampleSize('n1', n1);
  sampleSize('n2', n2);
  direction('direction', dir);
  const t = tQuantileUpper(p / 2, n1 + n2 - 2);
  return hedgesGFromD(dir * t * Math.sqrt((n1 + n2) / (n1 * n2)), n1, n2, 'smd.ind.p');
}
