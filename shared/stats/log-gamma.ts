const LN_SQRT_2PI = 0.9189385332046728; // ln √(2π)

/**
 * Stirling's series remainder lgamma(x) − [(x − ½)ln x − x + ln√(2π)] for x ≥ 10 (Abramowitz &
 * Stegun 6.1.41; the same role as lgammacor in Loader 2000 / R's nmath). Absolute error < 1e-17.
 * Example: lgammaCorrection(10) ≈ 0.00833056343336287.
 */
export function lgammaCorrection(x: number): number {
  const x2 = 1 / (x * x);
  // Bernoulli-number coefficients B_{2n} / (2n(2n−1)).
  return (
    (1 / 12 -
      x2 *
        (1 / 360 -
          x2 * (1 / 1260 - x2 * (1 / 1680 - x2 * (1 / 1188 - x2 * (691 / 360360 - x2 * (1 / 156 - x2 * (3617 / 122400)))))))) /
    x
  );
}

/**
 * Natural log of the gamma function for x > 0, to about 1e-15 absolute: shifts x up to ≥ 10 with the
 * recurrence Γ(x+1) = xΓ(x), then uses Stirling's series with its remainder (lgammaCorrection).
 * jStat's gammaln is the 6-term Lanczos form (~2e-10), too coarse for the t and χ² tails built on it.
 * Example: logGamma(0.5) ≈ 0.5723649429247001 (= ln √π).
 */
export function logGamma(x: number): number {
  if (!(x > 0)) throw new RangeError('logGamma needs x > 0');
  let shift = 0;
  let prod = 1;
  while (x < 10) {
    prod *= x;
    x += 1;
    shift++;
  }
  const base = (x - 0.5) * Math.log(x) - x + LN_SQRT_2PI + lgammaCorrection(x);
  return shift > 0 ? base - Math.log(prod) : base;
}

/**
 * ln B(a, b) for a, b > 0 without the cancellation of lgamma(a) + lgamma(b) − lgamma(a + b) when
 * one argument is large (the method of R's nmath lbeta, after Loader 2000). Example: logBeta(0.5, 0.5) = ln π.
 */
export function logBeta(a: number, b: number): number {
  const p = Math.min(a, b);
  const q = Math.max(a, b);
  if (p >= 10) {
    const corr = lgammaCorrection(p) + lgammaCorrection(q) - lgammaCorrection(p + q);
    return -0.5 * Math.log(q) + LN_SQRT_2PI + corr + (p - 0.5) * Math.log(p / (p + q)) + q * Math.log1p(-p / (p + q));
  }
  if (q >= 10) {
    const corr = lgammaCorrection(q) - lgammaCorrection(p + q);
    return logGamma(p) + corr + p - p * Math.log(p + q) + (q - 0.5) * Math.log1p(-p / (p + q));
  }
  return logGamma(p) + logGamma(q) - logGamma(p + q);
}

/**
 * Stirling error δ(n) = ln Γ(n+1) − (n + ½) ln n + n − ln√(2π) (Loader 2000), for n > 0.
 */
export function stirlingError(n: number): number {
  if (n >= 10) return lgammaCorrection(n);
  return logGamma(n + 1) - (n + 0.5) * Math.log(n) + n - LN_SQRT_2PI;
}
