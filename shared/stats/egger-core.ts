import type { EggerResult } from './types.js';
import { tTwoTailed } from './student-t.js';

/** Shifted sums for Egger's regression: x = 1/√v shifted by x0, z = y/√v shifted by z0. */
export interface EggerSums {
  x0: number;
  z0: number;
  sx: number;
  sz: number;
  sxx: number;
  sxz: number;
  szz: number;
  varEqual: boolean;
  effEqual: boolean;
}

/** x0 = √(Σw/k) (the RMS of x, near its mean) and z0 = μ̂_FE·x0 keep the one-pass cross-products from cancelling. */
export function eggerShifts(k: number, feMean: number, sumW: number): { x0: number; z0: number } {
  const x0 = Math.sqrt(sumW / k);
  return { x0, z0: feMean * x0 };
}

/** One pass computing the shifted sums (dl-tau2.ts fuses the same loop into its Q pass). */
export function eggerSums(y: Float64Array, v: Float64Array, feMean: number, sumW: number): EggerSums {
  const k = y.length;
  const { x0, z0 } = eggerShifts(k, feMean, sumW);
  let sx = 0, sz = 0, sxx = 0, sxz = 0, szz = 0;
  let varEqual = true;
  let effEqual = true;
  const v0 = v[0];
  const y0 = y[0];
  for (let i = 0; i < k; i++) {
    const vi = v[i];
    const yi = y[i];
    if (vi !== v0) varEqual = false;
    if (yi !== y0) effEqual = false;
    const x = Math.sqrt(1 / vi);
    const dx = x - x0;
    const dz = yi * x - z0;
    sx += dx;
    sz += dz;
    sxx += dx * dx;
    sxz += dx * dz;
    szz += dz * dz;
  }
  return { x0, z0, sx, sz, sxx, sxz, szz, varEqual, effEqual };
}

/**
 * Egger's regression from its sums: OLS of zᵢ = yᵢ/√vᵢ on xᵢ = 1/√vᵢ; the intercept, its SE,
 * t = intercept/SE and the two-tailed p on k − 2 df (Egger et al. 1997). Null for k < 3, when all
 * variances are equal (x constant), when all effects are equal, or when the fit is exact (SE 0).
 */
export function eggerFromSums(s: EggerSums, k: number): EggerResult | null {
  if (k < 3 || s.varEqual || s.effEqual) return null;
  const cxx = s.sxx - (s.sx * s.sx) / k;
  const cxz = s.sxz - (s.sx * s.sz) / k;
  const czz = s.szz - (s.sz * s.sz) / k;
  if (!(cxx > 0)) return null;
  const slope = cxz / cxx;
  const xbar = s.x0 + s.sx / k;
  const zbar = s.z0 + s.sz / k;
  const intercept = zbar - slope * xbar;
  const rss = czz - slope * cxz;
  if (!(rss > 0)) return null;
  const se = Math.sqrt((rss / (k - 2)) * (1 / k + (xbar * xbar) / cxx));
  const t = intercept / se;
  return { intercept, se, t, p: tTwoTailed(t, k - 2) };
}

/** Egger's regression on validated data (one pass). */
export function eggerCore(y: Float64Array, v: Float64Array, feMean: number, sumW: number): EggerResult | null {
  if (y.length < 3) return null;
  return eggerFromSums(eggerSums(y, v, feMean, sumW), y.length);
}
