import { positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';

/**
 * Log ratio of means for independent groups, ln(m1/m2), with variance s1²/(n1·m1²) + s2²/(n2·m2²)
 * (Hedges, Gurevitch & Curtis 1999, eqs. 1 and 9). Means must be positive (ratio-scale outcomes such as
 * reproduced durations); n ≥ 2 each. Example: logRatio(1100, 200, 20, 1000, 180, 20) → 0.0953102, variance ≈ 0.0032725.
 */
export function logRatio(
  mean1: number, sd1: number, n1: number, mean2: number, sd2: number, n2: number, formula = 'lnrom.ind',
): EffectSize {
  positive('mean1', mean1);
  positive('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n1', n1, 'sd1');
  sizeWithSd('n2', n2, 'sd2');
  const variance = (sd1 * sd1) / (n1 * mean1 * mean1) + (sd2 * sd2) / (n2 * mean2 * mean2);
  return result(Math.log(mean1 / mean2), variance, 'log_ratio', formula);
}
