import jStat from 'jstat';
import { regularizedBeta } from './regularized-beta.js';
import { logBeta } from './log-gamma.js';

/**
 * Two-tailed probability P(|T| > |t|) of Student's t with df > 0, as I_x(df/2, ½) with
 * x = df/(df + t²) (Abramowitz & Stegun 26.7.1), both beta tails formed without cancellation so the
 * result keeps ~1e-14 relative accuracy at any df (jStat's studentt.cdf is good to ~2e-8, and its
 * density fails above df ≈ 340). Example: tTwoTailed(2.0, 10) ≈ 0.07338803477074.
 */
export function tTwoTailed(t: number, df: number): number {
  if (!(df > 0)) throw new RangeError('t df must be positive');
  if (Number.isNaN(t)) return NaN;
  const t2 = t * t;
  if (t2 === Infinity) return 0;
  if (t2 === 0) return 1;
  const s = df + t2;
  const x = df / s;
  const y = t2 / s;
  const logX = -Math.log1p(t2 / df);
  const logY = Math.log(t2) - Math.log(s);
  if (t2 < 16 && y <= 0.5) {
    // Near the centre the continued fraction for I_x(df/2, ½) converges slowly at large df and its
    // rounding builds up (~1e-11 at df = 10⁶, t = 2); there p ≥ 6e-5, so 1 − I_y(½, df/2) from the
    // all-positive power series I_y(b, a) = yᵇxᵃ/(b·B(a, b)) · Σₙ (a + b)ₙ/(b + 1)ₙ · yⁿ is accurate instead.
    const a = df / 2;
    const b = 0.5;
    let term = 1;
    let sum = 1;
    for (let n = 0; n < 100000; n++) {
      term *= ((a + b + n) / (b + 1 + n)) * y;
      sum += term;
      if (term < 1e-17 * sum) break;
    }
    const central = Math.exp(b * logY + a * logX - logBeta(a, b)) * (sum / b);
    return 1 - central;
  }
  return regularizedBeta(x, y, df / 2, 0.5, logX, logY).lower;
}

/** Upper tail P(T > t) of Student's t with df degrees of freedom. Example: tUpperTail(0, 5) = 0.5. */
export function tUpperTail(t: number, df: number): number {
  const half = 0.5 * tTwoTailed(t, df);
  return t >= 0 ? half : 1 - half;
}

/** Density of Student's t with df > 0, in log form so it stays finite for any df. Example: tDensity(0, 1) = 1/π. */
export function tDensity(t: number, df: number): number {
  return Math.exp(-logBeta(df / 2, 0.5) - 0.5 * Math.log(df) - ((df + 1) / 2) * Math.log1p((t * t) / df));
}

/**
 * Upper quantile of Student's t: the t > 0 with P(T > t) = alpha, 0 < alpha ≤ ½ (e.g. alpha = 0.025
 * gives the 95% two-sided critical value). Start: exact forms for df = 1, 2, jStat.studentt.inv for
 * moderate df, a Cornish–Fisher expansion (Hill 1970) for large df; then Newton steps with the
 * accurate tail and density until a step is below 1e-10 relative (the next would be below rounding).
 * Example: tQuantileUpper(0.025, 10) ≈ 2.2281388519649385.
 */
export function tQuantileUpper(alpha: number, df: number): number {
  if (!(df > 0)) throw new RangeError('t df must be positive');
  if (!(alpha > 0 && alpha <= 0.5)) throw new RangeError('alpha must be in (0, 0.5]');
  if (alpha === 0.5) return 0;
  let t: number;
  if (df === 1) t = Math.tan(Math.PI * (0.5 - alpha));
  else if (df === 2) t = (1 - 2 * alpha) * Math.sqrt(2 / (4 * alpha * (1 - alpha)));
  else if (df < 100) t = jStat.studentt.inv(1 - alpha, df);
  else {
    const z = -jStat.normal.inv(alpha, 0, 1);
    const z2 = z * z;
    t =
      z +
      (z * (z2 + 1)) / (4 * df) +
      (z * (5 * z2 * z2 + 16 * z2 + 3)) / (96 * df * df) +
      (z * (3 * z2 * z2 * z2 + 19 * z2 * z2 + 17 * z2 - 15)) / (384 * df * df * df);
  }
  if (!(t > 0) || !Number.isFinite(t)) t = 1;
  for (let i = 0; i < 100; i++) {
    const tail = 0.5 * tTwoTailed(t, df);
    const dens = tDensity(t, df);
    let next = t + (tail - alpha) / dens;
    if (!(next > 0)) next = t / 2;
    // quadratic convergence: after a step below 1e-10 relative the error is below rounding
    if (Math.abs(next - t) <= 1e-10 * t) return next;
    t = next;
  }
  return t;
}
