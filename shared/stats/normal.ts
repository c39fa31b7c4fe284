import jStat from 'jstat';
import { regularizedGamma } from './regularized-gamma.js';

/**
 * Two-tailed normal probability P(|Z| > |z|) = erfc(|z|/√2) = Q(½, z²/2) (Abramowitz & Stegun 6.5.17),
 * through the accurate regularized gamma: jStat's erfc is about 1e-11 relative at z = 5 and underflows
 * to 0 before z = 10. Example: normalTwoTailed(1.959963984540054) ≈ 0.05.
 */
export function normalTwoTailed(z: number): number {
  if (Number.isNaN(z)) return NaN;
  return regularizedGamma(0.5, (z * z) / 2).upper;
}

/** Standard normal density. Example: normalDensity(0) ≈ 0.3989422804014327. */
export function normalDensity(z: number): number {
  return Math.exp(-0.5 * z * z) / 2.5066282746310002;
}

/**
 * Upper normal quantile: the z with P(Z > z) = alpha, 0 < alpha < 1. jStat's inverse (≈5e-10 relative
 * in the far tail) as a start, then Newton steps on the accurate tail.
 * Example: normalQuantileUpper(0.025) ≈ 1.959963984540054.
 */
export function normalQuantileUpper(alpha: number): number {
  if (!(alpha > 0 && alpha < 1)) throw new RangeError('alpha must be in (0, 1)');
  if (alpha === 0.5) return 0;
  if (alpha > 0.5) return -normalQuantileUpper(1 - alpha);
  let z = -jStat.normal.inv(alpha, 0, 1);
  for (let i = 0; i < 20; i++) {
    const tail = 0.5 * normalTwoTailed(z);
    const next = z + (tail - alpha) / normalDensity(z);
    if (Math.abs(next - z) <= 1e-15 * Math.abs(z)) return next;
    z = next;
  }
  return z;
}
