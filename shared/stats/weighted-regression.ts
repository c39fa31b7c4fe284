import { invertMatrix } from './small-matrix.js';

/** A weighted least-squares fit of y on the columns of X with weights 1/(v + τ²), and what the τ² estimators need. */
export interface WlsFit {
  beta: Float64Array;
  /** (X′WX)⁻¹, row-major p×p */
  cov: Float64Array;
  /** Σ wᵢeᵢ², eᵢ the residuals */
  Qres: number;
  /** Σ wᵢ²eᵢ² = y′PPy */
  yPPy: number;
  trP: number;
  trPP: number;
  /** restricted log-likelihood up to a constant */
  llReml: number;
}

/**
 * WLS of y on X (row-major k×p) with weights wᵢ = 1/(vᵢ + τ²); null if X′WX is singular. Uses
 * P = W − WX(X′WX)⁻¹X′W: tr P = Σw − tr(A·X′W²X), tr PP = Σw² − 2tr(A·X′W³X) + tr((A·X′W²X)²),
 * A = (X′WX)⁻¹ (Viechtbauer 2005 for the REML quantities).
 */
export function weightedRegression(y: Float64Array, v: Float64Array, X: Float64Array, p: number, tau2: number): WlsFit | null {
  const k = y.length;
  const XtWX = new Float64Array(p * p);
  const XtW2X = new Float64Array(p * p);
  const XtW3X = new Float64Array(p * p);
  const XtWy = new Float64Array(p);
  let sumW = 0;
  let sumW2 = 0;
  let logW = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / (v[i] + tau2);
    const w2 = w * w;
    sumW += w;
    sumW2 += w2;
    logW += Math.log(w);
    for (let a = 0; a < p; a++) {
      const xa = X[i * p + a];
      if (xa === 0) continue;
      XtWy[a] += w * xa * y[i];
      for (let b = 0; b < p; b++) {
        const xab = xa * X[i * p + b];
        XtWX[a * p + b] += w * xab;
        XtW2X[a * p + b] += w2 * xab;
        XtW3X[a * p + b] += w2 * w * xab;
      }
    }
  }
  const A = invertMatrix(XtWX, p);
  if (!A) return null;
  const beta = new Float64Array(p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) beta[a] += A[a * p + b] * XtWy[b];
  let Qres = 0;
  let yPPy = 0;
  for (let i = 0; i < k; i++) {
    let fit = 0;
    for (let a = 0; a < p; a++) fit += X[i * p + a] * beta[a];
    const e = y[i] - fit;
    const w = 1 / (v[i] + tau2);
    Qres += w * e * e;
    yPPy += w * w * e * e;
  }
  const AB2 = matMul(A, XtW2X, p);
  const AB3 = matMul(A, XtW3X, p);
  const AB2AB2 = matMul(AB2, AB2, p);
  let trAB2 = 0, trAB3 = 0, trAB2AB2 = 0;
  for (let a = 0; a < p; a++) {
    trAB2 += AB2[a * p + a];
    trAB3 += AB3[a * p + a];
    trAB2AB2 += AB2AB2[a * p + a];
  }
  return {
    beta,
    cov: A,
    Qres,
    yPPy,
    trP: sumW - trAB2,
    trPP: sumW2 - 2 * trAB3 + trAB2AB2,
    llReml: 0.5 * logW + 0.5 * logDetFromInverse(XtWX, p) - 0.5 * Qres,
  };
}

function matMul(a: Float64Array, b: Float64Array, p: number): Float64Array {
  const out = new Float64Array(p * p);
  for (let i = 0; i < p; i++) for (let k = 0; k < p; k++) {
    const aik = a[i * p + k];
    if (aik === 0) continue;
    for (let j = 0; j < p; j++) out[i * p + j] += aik * b[k * p + j];
  }
  return out;
}

/** −ln det(M) for a symmetric positive-definite M, by Cholesky. */
function logDetFromInverse(m: Float64Array, p: number): number {
  const L = new Float64Array(p * p);
  let logDet = 0;
  for (let j = 0; j < p; j++) {
    let s = m[j * p + j];
    for (let t = 0; t < j; t++) s -= L[j * p + t] * L[j * p + t];
    const d = Math.sqrt(Math.max(s, 1e-300));
    L[j * p + j] = d;
    logDet += 2 * Math.log(d);
    for (let i = j + 1; i < p; i++) {
      let r = m[i * p + j];
      for (let t = 0; t < j; t++) r -= L[i * p + t] * L[j * p + t];
      L[i * p + j] = r / d;
    }
  }
  return -logDet;
}
