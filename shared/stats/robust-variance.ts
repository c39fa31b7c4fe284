import { StatsInputError } from './errors.js';
import { tQuantileUpper, tTwoTailed } from './student-t.js';
import { prepareMultilevel, type MultilevelInput } from './multilevel-input.js';
import { fitMultilevel, summariseMultilevel, type MultilevelFit, type MultilevelResult } from './multilevel-pool.js';
import { cholesky, eigenWork, symmetricPower } from './small-symmetric.js';

export interface RobustCoefficient {
  estimate: number;
  se: number;
  statistic: number;
  p: number;
  ci_lower: number;
  ci_upper: number;
  df: number;
}

export interface RobustResult {
  estimate: number;
  se: number;
  /** Satterthwaite degrees of freedom */
  df: number;
  t: number;
  p: number;
  ci_lower: number;
  ci_upper: number;
  /** intercept first; present when moderators were given */
  coefficients?: RobustCoefficient[];
}

export type RobustInput = Omit<MultilevelInput, 'test'>;

/**
 * Cluster-robust (CR2, bias-reduced linearisation) variance of the three-level model's coefficients, with
 * the fitted model as working model: weights W = V̂⁻¹ and target Φ = V̂ (Bell & McCaffrey 2002; Tipton 2015;
 * Pustejovsky & Tipton 2018).
 *   V_CR2 = M (Σ_j X_jᵀW_jA_j e_j e_jᵀA_jW_jX_j) M,  M = (XᵀWX)⁻¹, e = y − Xβ̂,
 *   A_j = D_jᵀ (D_j Ω_jj D_jᵀ)^{−½} D_j with D_jᵀD_j = Φ_j and Ω_jj = Φ_j − X_jMX_jᵀ, the block of (I − H)Φ(I − H)ᵀ
 *   (eigenvalues below 1e-12 of the largest count as 0). Any factor D_j gives the same A_j; the Cholesky
 *   factor is used.
 * Each coefficient's t test and interval use Satterthwaite degrees of freedom, df = 2E²/Var of its
 * variance estimator under the working model (Pustejovsky & Tipton 2018, eq. 11). All work is per cluster:
 * O(Σ n_j³). Identical effects leave a robust variance of exactly 0; that is refused with a message.
 */
export function robustPool(input: RobustInput): RobustResult {
  const d = prepareMultilevel(input, 'robustPool');
  return robustFromFit(fitMultilevel(d));
}

/**
 * poolMultilevel and robustPool from one REML fit (the synthesis needs both): the robust part is an Error when
 * it cannot be formed (identical effects), the model's result otherwise stands.
 */
export function poolMultilevelWithRobust(input: MultilevelInput): { model: MultilevelResult; robust: RobustResult | Error } {
  const fit = fitMultilevel(prepareMultilevel(input, 'poolMultilevel'));
  const model = summariseMultilevel(fit);
  try {
    return { model, robust: robustFromFit(fit) };
  } catch (err) {
    if (err instanceof StatsInputError) return { model, robust: err };
    throw err;
  }
}

function robustFromFit(fit: MultilevelFit): RobustResult {
  const d = fit.d;
  const { k, p, clusters: J, v, x, start, level } = d;
  const { beta, vcov: M } = fit;
  const sb = fit.reml.sigma2Between;
  const sw = fit.reml.sigma2Within;
  const yRaw = new Float64Array(k);
  for (let i = 0; i < k; i++) yRaw[i] = d.y[i] + d.shift;
  const mChol = cholesky(M, p, 0);
  if (!mChol) throw new Error('robust variance: the model covariance of the coefficients is singular');

  const meat = new Float64Array(p * p);
  const sumD = new Float64Array(p);
  const sumD2 = new Float64Array(p);
  const sumH2 = new Float64Array(p);
  const cross = new Float64Array(p);
  const hh = new Float64Array(p * p * p); // for coefficient a: Σ_j h_j h_jᵀ, h_j = row a of H_j
  // per-cluster scratch, sized by the largest cluster and reused (no allocation per cluster)
  const N = d.maxSize;
  const phi = new Float64Array(N * N), Lbuf = new Float64Array(N * N), omega = new Float64Array(N * N);
  const g = new Float64Array(N * N), gInvSqrt = new Float64Array(N * N), A = new Float64Array(N * N), tmpNN = new Float64Array(N * N);
  const xm = new Float64Array(N * p), wx = new Float64Array(N * p), E = new Float64Array(p * N), me = new Float64Array(p * N);
  const om = new Float64Array(N), comp = new Float64Array(p), mex = new Float64Array(p * p), hj = new Float64Array(p * p);
  const work = eigenWork(N);

  for (let j = 0; j < J; j++) {
    const lo = start[j];
    const n = start[j + 1] - lo;
    const xj = x.subarray(lo * p, (lo + n) * p);
    // Φ_j = V̂_j and its Cholesky factor L (Φ = LLᵀ, so D = Lᵀ)
    for (let a = 0; a < n; a++) {
      for (let b = 0; b < n; b++) phi[a * n + b] = sb;
      phi[a * n + a] += v[lo + a] + sw;
    }
    const L = cholesky(phi, n, 0, Lbuf);
    if (!L) throw new Error('robust variance: a cluster covariance is not positive definite');
    // Ω_jj = Φ_j − X_j M X_jᵀ
    for (let a = 0; a < n; a++)
      for (let q = 0; q < p; q++) {
        let s = 0;
        for (let r = 0; r < p; r++) s += xj[a * p + r] * M[r * p + q];
        xm[a * p + q] = s;
      }
    for (let a = 0; a < n; a++)
      for (let b = 0; b <= a; b++) {
        let s = 0;
        for (let q = 0; q < p; q++) s += xm[a * p + q] * xj[b * p + q];
        const val = phi[a * n + b] - s;
        omega[a * n + b] = val;
        omega[b * n + a] = val;
      }
    // G = Lᵀ Ω L, its inverse square root, A = L G^{−½} Lᵀ
    lowerTransposeSandwich(L, omega, n, tmpNN, g);
    symmetricPower(g, n, -0.5, 1e-12, gInvSqrt, work);
    lowerSandwich(L, gInvSqrt, n, tmpNN, A);
    // E_j = X_jᵀ W_j A_j (p×n) with W_j = Φ_j⁻¹ applied in closed form
    let s = 0;
    for (let a = 0; a < n; a++) {
      om[a] = 1 / (v[lo + a] + sw);
      s += om[a];
    }
    const c = sb / (1 + sb * s);
    // wx = W_j X_j
    for (let q = 0; q < p; q++) {
      let dot = 0;
      for (let a = 0; a < n; a++) dot += om[a] * xj[a * p + q];
      for (let a = 0; a < n; a++) wx[a * p + q] = om[a] * (xj[a * p + q] - c * dot);
    }
    for (let q = 0; q < p; q++)
      for (let b = 0; b < n; b++) {
        let t = 0;
        for (let a = 0; a < n; a++) t += wx[a * p + q] * A[a * n + b];
        E[q * n + b] = t;
      }
    // residuals and this cluster's score
    comp.fill(0);
    for (let b = 0; b < n; b++) {
      let fitted = 0;
      for (let q = 0; q < p; q++) fitted += xj[b * p + q] * beta[q];
      const e = yRaw[lo + b] - fitted;
      for (let q = 0; q < p; q++) comp[q] += E[q * n + b] * e;
    }
    for (let q = 0; q < p; q++) for (let r = 0; r < p; r++) meat[q * p + r] += comp[q] * comp[r];
    // Satterthwaite pieces: ME = M E_j; d = diag(ME Φ MEᵀ); H_j = ME X_j C with CCᵀ = M
    for (let q = 0; q < p; q++)
      for (let b = 0; b < n; b++) {
        let t = 0;
        for (let r = 0; r < p; r++) t += M[q * p + r] * E[r * n + b];
        me[q * n + b] = t;
      }
    for (let q = 0; q < p; q++)
      for (let r = 0; r < p; r++) {
        let t = 0;
        for (let b = 0; b < n; b++) t += me[q * n + b] * xj[b * p + r];
        mex[q * p + r] = t;
      }
    for (let q = 0; q < p; q++)
      for (let r = 0; r < p; r++) {
        let t = 0;
        for (let m = r; m < p; m++) t += mex[q * p + m] * mChol[m * p + r];
        hj[q * p + r] = t;
      }
    for (let q = 0; q < p; q++) {
      // d_q = (ME Φ MEᵀ)_qq
      let dq = 0;
      for (let a = 0; a < n; a++) {
        let t = 0;
        for (let b = 0; b < n; b++) t += phi[a * n + b] * me[q * n + b];
        dq += me[q * n + a] * t;
      }
      let h2 = 0;
      for (let r = 0; r < p; r++) h2 += hj[q * p + r] * hj[q * p + r];
      sumD[q] += dq;
      sumD2[q] += dq * dq;
      sumH2[q] += h2;
      cross[q] += dq * h2;
      for (let r = 0; r < p; r++)
        for (let m = 0; m < p; m++) hh[q * p * p + r * p + m] += hj[q * p + r] * hj[q * p + m];
    }
  }

  const vcr = new Float64Array(p * p);
  {
    const tmp = new Float64Array(p * p);
    for (let q = 0; q < p; q++)
      for (let r = 0; r < p; r++) {
        let t = 0;
        for (let m = 0; m < p; m++) t += M[q * p + m] * meat[m * p + r];
        tmp[q * p + r] = t;
      }
    for (let q = 0; q < p; q++)
      for (let r = 0; r < p; r++) {
        let t = 0;
        for (let m = 0; m < p; m++) t += tmp[q * p + m] * M[m * p + r];
        vcr[q * p + r] = t;
      }
  }

  for (let q = 0; q < p; q++) {
    if (!(vcr[q * p + q] > 1e-24 * M[q * p + q]))
      throw new StatsInputError(
        `the robust variance of ${q === 0 ? 'the estimate' : `moderators[${q - 1}]`} is 0: every effect equals its fitted value ` +
          '(identical effects), so no robust t test or interval can be formed; use the model-based result of poolMultilevel',
        'effects',
      );
  }
  const alpha = (1 - level) / 2;
  const coefficients: RobustCoefficient[] = [];
  for (let q = 0; q < p; q++) {
    let frob = 0;
    for (let r = 0; r < p * p; r++) frob += hh[q * p * p + r] * hh[q * p * p + r];
    const expectation = sumD[q] - sumH2[q];
    const sumSquares = sumD2[q] - 2 * cross[q] + frob;
    const df = (expectation * expectation) / sumSquares;
    const estimate = beta[q];
    const se = Math.sqrt(vcr[q * p + q]);
    const statistic = estimate / se;
    const crit = tQuantileUpper(alpha, df);
    coefficients.push({
      estimate,
      se,
      statistic,
      p: tTwoTailed(statistic, df),
      ci_lower: estimate - crit * se,
      ci_upper: estimate + crit * se,
      df,
    });
  }
  const c0 = coefficients[0];
  const result: RobustResult = {
    estimate: c0.estimate,
    se: c0.se,
    df: c0.df,
    t: c0.statistic,
    p: c0.p,
    ci_lower: c0.ci_lower,
    ci_upper: c0.ci_upper,
  };
  if (d.withModerators) result.coefficients = coefficients;
  return result;
}

/** Lᵀ S L for lower-triangular L and symmetric S (n×n), into `out`; `sl` is scratch. */
function lowerTransposeSandwich(L: Float64Array, S: Float64Array, n: number, sl: Float64Array, out: Float64Array): Float64Array {
  for (let a = 0; a < n; a++)
    for (let b = 0; b < n; b++) {
      let t = 0;
      for (let m = b; m < n; m++) t += S[a * n + m] * L[m * n + b];
      sl[a * n + b] = t;
    }
  for (let a = 0; a < n; a++)
    for (let b = 0; b <= a; b++) {
      let t = 0;
      for (let m = a; m < n; m++) t += L[m * n + a] * sl[m * n + b];
      out[a * n + b] = t;
      out[b * n + a] = t;
    }
  return out;
}

/** L S Lᵀ for lower-triangular L and symmetric S (n×n), into `out`; `ls` is scratch. */
function lowerSandwich(L: Float64Array, S: Float64Array, n: number, ls: Float64Array, out: Float64Array): Float64Array {
  for (let a = 0; a < n; a++)
    for (let b = 0; b < n; b++) {
      let t = 0;
      for (let m = 0; m <= a; m++) t += L[a * n + m] * S[m * n + b];
      ls[a * n + b] = t;
    }
  for (let a = 0; a < n; a++)
    for (let b = 0; b <= a; b++) {
      let t = 0;
      for (let m = 0; m <= b; m++) t += ls[a * n + m] * L[b * n + m];
      out[a * n + b] = t;
      out[b * n + a] = t;
    }
  return out;
}
