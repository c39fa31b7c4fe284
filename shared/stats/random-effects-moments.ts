/** Levels of the power series kept by the random-effects pass (n = 0 … LEVELS − 1). */
export const LEVELS = 9;
/** Largest |δ|·w_max for which the series is used: 0.01^9 = 1e-18 relative truncation. */
export const SERIES_LIMIT = 0.01;

export interface RandomEffectsMoments {
  /** M[3n + j] = Σ wᵢ·(wᵢ/w_max)ⁿ·dᵢʲ, wᵢ = 1/(vᵢ + τ²), dᵢ = yᵢ − shift */
  M: Float64Array;
  tau2: number;
  shift: number;
  wMax: number;
}

/**
 * One pass over the data at τ²: the random-effects sums (n = 0) and the higher power-series moments that
 * give the generalized Q near τ² without another pass, since
 * 1/(v + τ² + δ) = Σₙ (−δ)ⁿ/(v + τ²)ⁿ⁺¹ (used while |δ|·w_max ≤ SERIES_LIMIT). Written out with scalar
 * accumulators so the loop stays in registers. Stores the weights into `weights` when given.
 */
export function randomEffectsMoments(
  y: Float64Array, v: Float64Array, tau2: number, shift: number, wMax: number, weights: number[] | null,
): RandomEffectsMoments {
  const k = y.length;
  const inv = 1 / wMax;
  let m00 = 0, m01 = 0, m02 = 0, m10 = 0, m11 = 0, m12 = 0, m20 = 0, m21 = 0, m22 = 0, m30 = 0, m31 = 0, m32 = 0, m40 = 0, m41 = 0, m42 = 0, m50 = 0, m51 = 0, m52 = 0, m60 = 0, m61 = 0, m62 = 0, m70 = 0, m71 = 0, m72 = 0, m80 = 0, m81 = 0, m82 = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / (v[i] + tau2);
    if (weights !== null) weights[i] = w;
    const d = y[i] - shift;
    const u = w * inv;
    let p = w;
    let pd = p * d;
    m00 += p;
    m01 += pd;
    m02 += pd * d;
    p *= u;
    pd = p * d;
    m10 += p;
    m11 += pd;
    m12 += pd * d;
    p *= u;
    pd = p * d;
    m20 += p;
    m21 += pd;
    m22 += pd * d;
    p *= u;
    pd = p * d;
    m30 += p;
    m31 += pd;
    m32 += pd * d;
    p *= u;
    pd = p * d;
    m40 += p;
    m41 += pd;
    m42 += pd * d;
    p *= u;
    pd = p * d;
    m50 += p;
    m51 += pd;
    m52 += pd * d;
    p *= u;
    pd = p * d;
    m60 += p;
    m61 += pd;
    m62 += pd * d;
    p *= u;
    pd = p * d;
    m70 += p;
    m71 += pd;
    m72 += pd * d;
    p *= u;
    pd = p * d;
    m80 += p;
    m81 += pd;
    m82 += pd * d;
  }
  return { M: Float64Array.of(m00, m01, m02, m10, m11, m12, m20, m21, m22, m30, m31, m32, m40, m41, m42, m50, m51, m52, m60, m61, m62, m70, m71, m72, m80, m81, m82), tau2, shift, wMax };
}

/**
 * The generalized Q at τ² + δ from the moments, with T = Σ wᵢ²(dᵢ − m)² (its negative derivative), or null
 * when |δ|·w_max is too large for the series.
 */
export function seriesQ(mom: RandomEffectsMoments, tau2: number): { Q: number; T: number; sumW: number; mean: number } | null {
  const x = -(tau2 - mom.tau2) * mom.wMax;
  if (!(Math.abs(x) <= SERIES_LIMIT)) return null;
  const M = mom.M;
  let s0 = 0, s1 = 0, s2 = 0, t0 = 0, t1 = 0, t2 = 0;
  let f = 1;
  for (let n = 0; n < LEVELS; n++) {
    s0 += f * M[3 * n];
    s1 += f * M[3 * n + 1];
    s2 += f * M[3 * n + 2];
    if (n + 1 < LEVELS) {
      const c = (n + 1) * f;
      t0 += c * M[3 * n + 3];
      t1 += c * M[3 * n + 4];
      t2 += c * M[3 * n + 5];
    }
    f *= x;
  }
  const m = s1 / s0;
  return {
    Q: Math.max(0, s2 - s1 * m),
    T: Math.max(0, mom.wMax * (t2 - 2 * m * t1 + m * m * t0)),
    sumW: s0,
    mean: mom.shift + m,
  };
}
