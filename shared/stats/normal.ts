import jStat from 'jstat';

const TWO_OVER_SQRT_PI = 1.1283791670955126;

/**
 * Two-tailed normal probability P(|Z| > |z|) = erfc(|z|/√2) = Q(½, z²/2) (Abramowitz & Stegun 6.5.17),
 * with the incomplete-gamma series (x < 1.5) or Lentz's continued fraction (Press et al., Numerical
 * Recipes §6.2) and the exact prefactor 2√x·e⁻ˣ/√π for a = ½; ~1e-15 relative into the far tail
 * (jStat's erfc is ~1e-11 relative at z = 5 and underflows to 0 before z = 10).
 * Example: normalTwoTailed(1.959963984540054) ≈ 0.05.
 */
export function normalTwoTailed(z: number): number {
  if (Number.isNaN(z)) return NaN;
  const x = 0.5 * z * z;
  if (x === Infinity) return 0;
  if (x === 0) return 1;
  // front = xᵃe⁻ˣ/Γ(a + 1) with a = ½, Γ(3/2) = √π/2
  const front = TWO_OVER_SQRT_PI * Math.sqrt(x) * Math.exp(-x);
  if (x < 1.5) {
    let term = 1;
    let sum = 1;
    for (let n = 1; n < 200; n++) {
      term *= x / (0.5 + n);
      sum += term;
      if (term < sum * 1e-17) break;
    }
    return 1 - front * sum;
  }
  let b = x + 0.5;
  let c = 1e300;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * (i - 0.5);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < 1e-300) d = 1e-300;
    c = b + an / c;
    if (Math.abs(c) < 1e-300) c = 1e-300;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 2.5e-16) break;
  }
  return 0.5 * front * h;
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
    if (Math.abs(next - z) <= 1e-10 * Math.abs(z)) return next; // quadratic convergence
    z = next;
  }
  return z;
}
