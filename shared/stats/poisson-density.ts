import { stirlingError } from './log-gamma.js';

const SQRT_2PI = 2.5066282746310007; // √(2π), the double nearest to 2.50662827463100050…

/** Loader's deviance term bd0(x, m) = x ln(x/m) + m − x, computed without cancellation near x = m (Loader 2000). */
export function devianceTerm(x: number, m: number): number {
  if (Math.abs(x - m) < 0.1 * (x + m)) {
    let v = (x - m) / (x + m);
    let s = (x - m) * v;
    let ej = 2 * x * v;
    v *= v;
    for (let j = 1; j < 1000; j++) {
      ej *= v;
      const s1 = s + ej / (2 * j + 1);
      if (s1 === s) return s1;
      s = s1;
    }
    return s;
  }
  return x * Math.log(x / m) + m - x;
}

/**
 * xᵃ e⁻ˣ / Γ(a + 1) for a ≥ 0, x ≥ 0, accurate to a few ulps even for a, x ~ 10⁶ (Loader 2000's
 * saddle-point form exp(−δ(a) − bd0(a, x)) / √(2πa), the basis of R's dpois_raw).
 * It is the prefactor of the regularized incomplete gamma functions. Example: poissonDensity(2, 2) ≈ 0.2706705664732254.
 */
export function poissonDensity(a: number, x: number): number {
  if (x === 0) return a === 0 ? 1 : 0;
  if (a === 0) return Math.exp(-x);
  return Math.exp(-stirlingError(a) - devianceTerm(a, x)) / (SQRT_2PI * Math.sqrt(a));
}
