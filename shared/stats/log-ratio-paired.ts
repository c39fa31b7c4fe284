import { correlation, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';

/**
 * Log ratio of means for a within-subject (paired) design, ln(m1/m2), with variance
 * s1²/(n·m1²) + s2²/(n·m2²) − 2r·s1·s2/(n·m1·m2) (Lajeunesse 2011, eq. 8 for dependent means).
 * Example: logRatioPaired(1100, 200, 1000, 180, 20, 0.5) → 0.0953102, variance ≈ 0.0016365.
 */
export function logRatioPaired(mean1: number, sd1: number, mean2: number, sd2: number, n: number, r: number): EffectSize {
  positive('mean1', mean1);
  positive('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n', n, 'sd1');
  correlation('r', r);
  const a = sd1 / mean1;
  const b = sd2 / mean2;
  return result(Math.log(mean1 / mean2), (a * a + b * b - 2 * r * a * b) / n, 'log_ratio', 'lnrom.paired');
}
