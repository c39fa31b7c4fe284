import { regularizedBeta } from './regularized-beta.js';

/**
 * Upper tail P(F > f) of the F distribution on (d1, d2) df: I_x(d2/2, d1/2) with x = d2/(d2 + d1·f)
 * (Abramowitz & Stegun 26.6.2), both tails of the incomplete beta formed without cancellation.
 * Example: fUpperTail(1, 1, 1) = 0.5; fUpperTail(t², 1, ν) equals the two-tailed t p on ν df.
 */
export function fUpperTail(f: number, d1: number, d2: number): number {
  if (!(d1 > 0 && d2 > 0)) throw new RangeError('F df must be positive');
  if (Number.isNaN(f)) return NaN;
  if (f <= 0) return 1;
  if (f === Infinity) return 0;
  const s = d2 + d1 * f;
  const x = d2 / s;
  const y = (d1 * f) / s;
  return regularizedBeta(x, y, d2 / 2, d1 / 2, Math.log(d2) - Math.log(s), Math.log(d1 * f) - Math.log(s)).lower;
}
