import { correlation, result, sampleSize, type EffectSize } from './effect-checks.js';

/**
 * Fisher's z transform of a correlation, z = atanh(r) = ½ ln((1 + r)/(1 − r)), variance 1/(n − 3)
 * (Borenstein et al. 2009, ch. 6, eqs. 6.2–6.3). Input: −1 < r < 1, n ≥ 4.
 * Example: fisherZ(0.5, 103) → z ≈ 0.5493061, variance = 0.01.
 */
export function fisherZ(r: number, n: number): EffectSize {
  correlation('r', r);
  sampleSize('n', n, 4);
  return result(Math.atanh(r), 1 / (n - 3), 'fisher_z', 'fisher_z');
}
