import { dlTau2 } from './dl-tau2.js';

interface RemlEval {
  ll: number;
  step: number;
}

/** Restricted log-likelihood (up to a constant) and the Fisher-scoring step at τ² for the intercept-only model. */
function remlEval(y: Float64Array, v: Float64Array, tau2: number, shift: number): RemlEval {
  let s0 = 0;
  let s1 = 0;
  let s2 = 0;
  let w2 = 0;
  let w3 = 0;
  let w2d = 0;
  let w2dd = 0;
  let logW = 0;
  for (let i = 0; i < y.length; i++) {
    const w = 1 / (v[i] + tau2);
    const d = y[i] - shift;
    const wd = w * d;
    s0 += w;
    s1 += wd;
    s2 += wd * d;
    const ww = w * w;
    w2 += ww;
    w3 += ww * w;
    w2d += ww * d;
    w2dd += ww * d * d;
    logW += Math.log(w);
  }
  const m = s1 / s0;
  const Q = Math.max(0, s2 - s1 * m);
  const yPPy = Math.max(0, w2dd - 2 * m * w2d + m * m * w2);
  const trP = s0 - w2 / s0;
  const trPP = w2 - (2 * w3) / s0 + (w2 / s0) * (w2 / s0);
  return { ll: 0.5 * logW - 0.5 * Math.log(s0) - 0.5 * Q, step: trPP > 0 ? (yPPy - trP) / trPP : 0 };
}

function fisherScoring(y: Float64Array, v: Float64Array, start: number, shift: number): { tau2: number; ll: number } {
  let tau2 = Math.max(0, start);
  let cur = remlEval(y, v, tau2, shift);
  for (let iter = 0; iter < 1000; iter++) {
    let step = cur.step;
    if (tau2 === 0 && step <= 0) break; // boundary maximum
    while (tau2 + step < 0) step /= 2;
    // step halving also when the likelihood drops (Fisher scoring can overshoot far from the peak)
    let next = tau2 + step;
    let ev = remlEval(y, v, next, shift);
    let halvings = 0;
    while (ev.ll < cur.ll - 1e-12 * Math.abs(cur.ll) && halvings < 60) {
      step /= 2;
      next = tau2 + step;
      ev = remlEval(y, v, next, shift);
      halvings++;
    }
    const converged = Math.abs(next - tau2) <= 1e-14 * Math.max(next, tau2) || next === tau2;
    tau2 = next;
    cur = ev;
    if (converged) break;
  }
  return { tau2, ll: cur.ll };
}

/**
 * REML estimate of τ² for the intercept-only random-effects model by Fisher scoring (Viechtbauer
 * 2005; the score (y′PPy − tr P)/2 over the information tr(PP)/2), with step halving to stay at
 * τ² ≥ 0 and to keep the likelihood rising. The likelihood can have more than one peak, so scoring
 * starts from the DerSimonian–Laird value and from a large value, and the restricted likelihood at the
 * converged points and at τ² = 0 is compared: the global maximum over τ² ≥ 0 is returned.
 */
export function remlTau2(y: Float64Array, v: Float64Array, shift: number): number {
  const dl = dlTau2(y, v).tau2;
  let vmax = 0;
  let ymin = Infinity;
  let ymax = -Infinity;
  for (let i = 0; i < y.length; i++) {
    if (v[i] > vmax) vmax = v[i];
    if (y[i] < ymin) ymin = y[i];
    if (y[i] > ymax) ymax = y[i];
  }
  const candidates = [fisherScoring(y, v, dl, shift), fisherScoring(y, v, Math.max(vmax, (ymax - ymin) ** 2), shift)];
  candidates.push({ tau2: 0, ll: remlEval(y, v, 0, shift).ll });
  let best = candidates[0];
  for (const c of candidates) if (c.ll > best.ll) best = c;
  return best.tau2;
}
