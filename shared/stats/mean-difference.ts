import { finite, positive, result, sampleSize, type EffectSize } from './effect-checks.js';

/**
 * Raw mean difference D = m1 − m2 for independent groups in the outcome's units (ms), with variance
 * s1²/n1 + s2²/n2 (Borenstein et al. 2009, ch. 4, eq. 4.4, the form that does not assume equal SDs).
 * Example: meanDifference(103, 5.5, 50, 100, 4.5, 50) → D = 3, variance = 1.01.
 */
export function meanDifference(mean1: number, sd1: number, n1: number, mean2: number, sd2: number, n2: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sampleSize('n1', n1, 1);
  sampleSize('n2', n2, 1);
  return result(mean1 - mean2, (sd1 * sd1) / n1 + (sd2 * sd2) / n2, 'mean_diff', 'md.ind.sds');
}
