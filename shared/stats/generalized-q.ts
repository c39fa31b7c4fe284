/**
 * The generalized Q statistic Q(τ²) = Σ wᵢ(yᵢ − μ̂)², wᵢ = 1/(vᵢ + τ²), with μ̂ its weighted mean,
 * and T(τ²) = Σ wᵢ²(yᵢ − μ̂)² = −dQ/dτ² (DerSimonian & Kacker 2007). One pass; `shift` should be
 * close to the weighted mean (e.g. the fixed-effect estimate) so the one-pass form does not cancel.
 */
export function generalizedQ(
  y: Float64Array,
  v: Float64Array,
  tau2: number,
  shift: number,
): { Q: number; T: number; sumW: number; mean: number } {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let w2 = 0;
  let w2d = 0;
  let w2dd = 0;
  const k = y.length;
  for (let i = 0; i < k; i++) {
    const w = 1 / (v[i] + tau2);
    const d = y[i] - shift;
    const wd = w * d;
    s0 += w;
    s1 += wd;
    s2 += wd * d;
    const ww = w * w;
    w2 += ww;
    w2d += ww * d;
    w2dd += ww * d * d;
  }
  const m = s1 / s0;
  const Q = Math.max(0, s2 - s1 * m);
  const T = Math.max(0, w2dd - 2 * m * w2d + m * m * w2);
  return { Q, T, sumW: s0, mean: shift + m };
}

/**
 * The τ² ≥ 0 at which the generalized Q equals `target` (the Paule–Mandel estimating equation with
 * target k − 1, or a Q-profile bound with a χ² quantile; Viechtbauer 2007). Q(τ²) decreases
 * monotonically, so the root is unique; 0 when Q(0) ≤ target. Newton steps on 1/Q(τ²), which is
 * close to linear in τ², kept inside a bracket (bisection otherwise), until the step is below 1e-15
 * relative (or a
 * Newton step below 1e-9 relative, after which the error is at the rounding level). `evaluate` may
 * replace the pass over the data (e.g. by the power series of random-effects-moments.ts).
 */
export function solveGeneralizedQ(
  y: Float64Array,
  v: Float64Array,
  target: number,
  start: number,
  shift: number,
  q0?: number,
  evaluate: (tau2: number) => { Q: number; T: number } = (t) => generalizedQ(y, v, t, shift),
): number {
  const atZero = q0 ?? generalizedQ(y, v, 0, shift).Q;
  if (!(atZero > target)) return 0;
  let lo = 0;
  let hi = Infinity;
  let x = start > 0 && Number.isFinite(start) ? start : 0;
  for (let iter = 0; iter < 300; iter++) {
    const { Q, T } = evaluate(x);
    if (Q === target) return x;
    if (Q > target) lo = x;
    else hi = x;
    let next = T > 0 ? x + ((Q - target) / T) * (Q / target) : NaN;
    let newton = true;
    if (!(next > lo && next < hi)) {
      newton = false;
      if (hi === Infinity) next = x > 0 ? 2 * x : 1;
      else next = 0.5 * (lo + hi);
    }
    // Newton converges quadratically here: once a step is below 1e-9 relative, the next one would be
    // below the rounding noise of Q itself (~k·1e-16), so further passes over the data buy nothing.
    const step = Math.abs(next - x);
    if ((newton && step <= 1e-9 * Math.max(next, x)) || step <= 1e-15 * Math.max(next, x)) return next;
    if (hi < Infinity && hi - lo <= 1e-15 * hi) return next;
    x = next;
  }
  return x;
}
