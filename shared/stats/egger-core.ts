import type { EggerResult } from './types.js';
import { tTwoTailed } from './student-t.js';

/**
 * Egger's regression on validated data: OLS of zᵢ = yᵢ/√vᵢ on xᵢ = 1/√vᵢ; the intercept, its SE,
 * t = intercept/SE and the two-tailed p on k − 2 df. Null for k < 3, when all variances are equal
 * (x constant), when all effects are equal, or when the fit is exact (SE 0). One pass, with the sums
 * shifted by values near the means so that the centred cross-products keep their precision.
 */
export function eggerCore(y: Float64Array, v: Float64Array, feMean: number, sumW: number): EggerResult | null {
  const k = y.length;
  if (k < 3) return null;
  const x0 = Math.sqrt(sumW / k);
  const z0 = feMean * x0;
  let sx = 0;
  let sz = 0;
  let sxx = 0;
  let sxz = 0;
  let szz = 0;
  let varEqual = true;
  let effEqual = true;
  const v0 = v[0];
  const y0 = y[0];
  for (let i = 0; i < k; i++) {
    const vi = v[i];
    const yi = y[i];
    if (vi !== v0) varEqual = false;
    if (yi !== y0) effEqual = false;
    const x = 1 / Math.sqrt(vi);
    const dx = x - x0;
    const dz = yi * x - z0;
    sx += dx;
    sz += dz;
    sxx += dx * dx;
    sxz += dx * dz;
    szz += dz * dz;
  }
  if (varEqual || effEqual) return null;
  const cxx = sxx - (sx * sx) / k;
  const cxz = sxz - (sx * sz) / k;
  const czz = szz - (sz * sz) / k;
  if (!(cxx > 0)) return null;
  const slope = cxz / cxx;
  const xbar = x0 + sx / k;
  const zbar = z0 + sz / k;
  const intercept = zbar - slope * xbar;
  const rss = czz - slope * cxz;
  if (!(rss > 0)) return null;
  const s2 = rss / (k - 2);
  const se = Math.sqrt(s2 * (1 / k + (xbar * xbar) / cxx));
  const t = intercept / se;
  return { intercept, se, t, p: tTwoTailed(t, k - 2) };
}
