import { eggerShifts, type EggerSums } from './egger-core.js';

export interface FixedEffectSums {
  tau2: number;
  Q: number;
  sumW: number;
  sumW2: number;
  feMean: number;
  vmin: number;
  /** Egger's regression sums, when asked for (fused into the Q pass) */
  egger: EggerSums | null;
}

/**
 * DerSimonian–Laird (1986) moment estimator τ² = max(0, (Q − (k − 1)) / (Σw − Σw²/Σw)), w = 1/v,
 * with the fixed-effect sums it is built from. Q uses a two-pass centred form, and Σwy Neumaier
 * summation, so large offsets do not cancel; identical effects give exactly Q = 0. With `withEgger`
 * the second pass also gathers Egger's regression sums (saving pool() a pass over the data).
 */
export function dlTau2(y: Float64Array, v: Float64Array, withEgger = false): FixedEffectSums {
  const k = y.length;
  let sumW = 0;
  let sumW2 = 0;
  let sumWY = 0;
  let comp = 0;
  let allEqual = true;
  let vmin = Infinity;
  const y0 = y[0];
  for (let i = 0; i < k; i++) {
    const yi = y[i];
    const vi = v[i];
    if (yi !== y0) allEqual = false;
    if (vi < vmin) vmin = vi;
    const w = 1 / vi;
    sumW += w;
    sumW2 += w * w;
    const x = w * yi;
    const t = sumWY + x;
    comp += Math.abs(sumWY) >= Math.abs(x) ? sumWY - t + x : x - t + sumWY;
    sumWY = t;
  }
  // identical effects: the mean is exactly that value and Q exactly 0 (no rounding residue)
  const feMean = allEqual ? y0 : (sumWY + comp) / sumW;
  let Q = 0;
  let egger: EggerSums | null = null;
  if (withEgger) {
    const { x0, z0 } = eggerShifts(k, feMean, sumW);
    let sx = 0, sz = 0, sxx = 0, sxz = 0, szz = 0;
    let varEqual = true;
    const v0 = v[0];
    for (let i = 0; i < k; i++) {
      const vi = v[i];
      const yi = y[i];
      if (vi !== v0) varEqual = false;
      const d = yi - feMean;
      const w = 1 / vi;
      Q += d * d * w;
      const x = Math.sqrt(w);
      const dx = x - x0;
      const dz = yi * x - z0;
      sx += dx;
      sz += dz;
      sxx += dx * dx;
      sxz += dx * dz;
      szz += dz * dz;
    }
    egger = { x0, z0, sx, sz, sxx, sxz, szz, varEqual, effEqual: allEqual };
  } else {
    for (let i = 0; i < k; i++) {
      const d = y[i] - feMean;
      Q += (d * d) / v[i];
    }
  }
  const c = sumW - sumW2 / sumW;
  const tau2 = k > 1 && c > 0 ? Math.max(0, (Q - (k - 1)) / c) : 0;
  return { tau2, Q, sumW, sumW2, feMean, vmin, egger };
}
