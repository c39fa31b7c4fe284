import { weightedRegression } from './weighted-regression.js';

export type ResidualMethod = 'FE' | 'MM' | 'REML' | 'PM';

/**
 * Residual heterogeneity τ²_res of a meta-regression on design X (k×p, row-major):
 * - FE: 0;
 * - MM (the DerSimonian–Laird moment estimator generalized to regression; Raudenbush 2009):
 *   max(0, (Q_E − (k − p)) / tr P₀), Q_E and P₀ at τ² = 0;
 * - PM: the τ² ≥ 0 with Σwᵢeᵢ² = k − p (Paule & Mandel 1982), by bracketed Newton steps (dQ/dτ² = −y′PPy);
 * - REML: Fisher scoring τ² += (y′PPy − tr P)/tr PP with step halving, started from MM and from a large
 *   value, keeping the global maximum of the restricted likelihood over τ² ≥ 0 (compared with τ² = 0).
 */
export function residualTau2(y: Float64Array, v: Float64Array, X: Float64Array, p: number, method: ResidualMethod): number {
  if (method === 'FE') return 0;
  const k = y.length;
  const at0 = weightedRegression(y, v, X, p, 0);
  if (!at0) return NaN;
  const mm = at0.trP > 0 ? Math.max(0, (at0.Qres - (k - p)) / at0.trP) : 0;
  if (method === 'MM') return mm;
  if (method === 'PM') {
    const target = k - p;
    if (!(at0.Qres > target)) return 0;
    let lo = 0;
    let hi = Infinity;
    let x = mm;
    for (let iter = 0; iter < 300; iter++) {
      const fit = weightedRegression(y, v, X, p, x);
      if (!fit) return NaN;
      if (fit.Qres === target) return x;
      if (fit.Qres > target) lo = x;
      else hi = x;
      let next = fit.yPPy > 0 ? x + ((fit.Qres - target) / fit.yPPy) * (fit.Qres / target) : NaN;
      let newton = true;
      if (!(next > lo && next < hi)) {
        newton = false;
        next = hi === Infinity ? (x > 0 ? 2 * x : 1) : 0.5 * (lo + hi);
      }
      const step = Math.abs(next - x);
      if ((newton && step <= 1e-9 * Math.max(next, x)) || step <= 1e-15 * Math.max(next, x)) return next;
      x = next;
    }
    return x;
  }
  // REML
  let ymin = Infinity, ymax = -Infinity, vmax = 0;
  for (let i = 0; i < k; i++) {
    if (y[i] < ymin) ymin = y[i];
    if (y[i] > ymax) ymax = y[i];
    if (v[i] > vmax) vmax = v[i];
  }
  const candidates = [scoring(y, v, X, p, mm), scoring(y, v, X, p, Math.max(vmax, (ymax - ymin) ** 2))];
  candidates.push({ tau2: 0, ll: at0.llReml });
  let best = candidates[0];
  for (const c of candidates) if (c.ll > best.ll) best = c;
  return best.tau2;
}

function scoring(y: Float64Array, v: Float64Array, X: Float64Array, p: number, start: number): { tau2: number; ll: number } {
  let tau2 = Math.max(0, start);
  let cur = weightedRegression(y, v, X, p, tau2);
  if (!cur) return { tau2, ll: -Infinity };
  for (let iter = 0; iter < 1000; iter++) {
    let step = cur.trPP > 0 ? (cur.yPPy - cur.trP) / cur.trPP : 0;
    if (tau2 === 0 && step <= 0) break;
    while (tau2 + step < 0) step /= 2;
    let next = tau2 + step;
    let fit = weightedRegression(y, v, X, p, next);
    let halvings = 0;
    while (fit && fit.llReml < cur.llReml - 1e-12 * Math.abs(cur.llReml) && halvings < 60) {
      step /= 2;
      next = tau2 + step;
      fit = weightedRegression(y, v, X, p, next);
      halvings++;
    }
    if (!fit) break;
    const converged = Math.abs(next - tau2) <= 1e-14 * Math.max(next, tau2) || next === tau2;
    tau2 = next;
    cur = fit;
    if (converged) break;
  }
  return { tau2, ll: cur.llReml };
}
