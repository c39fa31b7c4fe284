// Psychometric functions p(x) = guess + (1 − guess − λ)·F(a + b·x) fitted by binomial maximum likelihood
// (Wichmann & Hill 2001a). F is the standard normal cdf (cumulative Gaussian, probit) or the logistic cdf.
import { normalDensity } from '../stats/normal.js';
import { upperTail } from './normal-tail.js';
import { binomialDeviance, kernelLoglik, logChooseSum } from './binomial.js';
import { inverseOn, maximise, type Bound, type Evaluation, type MaximiseResult } from './maximise.js';
import { PsychophysicsInputError, validateCounts, type Counts } from './validate.js';

export const PSYCHOMETRIC_MODELS = ['cumulative_gaussian', 'logistic'] as const;
export type PsychometricModel = (typeof PSYCHOMETRIC_MODELS)[number];

/** Upper bound of the lapse rate (Wichmann & Hill 2001a used [0, 0.06], from memory; the contract allows 0.1). */
export const LAPSE_MAX = 0.1;
/** Φ⁻¹(0.75), the 75% point of the standard normal. */
export const PROBIT_Z75 = 0.6744897501960817;

export interface PsychometricInput {
  x: ArrayLike<number>;
  n: ArrayLike<number>;
  k: ArrayLike<number>;
  model: PsychometricModel;
  lapse?: boolean;
  guess?: number;
}

/**
 * pse and spread are the 50% point (−a/b) and 1/b of F, so with guess 0 and no lapse they are the GLM's;
 * spread (and jnd = spread·Φ⁻¹(0.75) or spread·ln 3) is negative when the response falls with x.
 * lapse is λ̂ when fitted, 0 when fixed. When no finite maximum exists (all responses one way, perfect
 * separation) or the iteration fails, converged is false and every estimate and SE is null; deviance and
 * loglik are then the supremum (separated data) or the last iterate's. One row of x, n, k is one level of the
 * saturated model (df = rows − free parameters; rows sharing an x are not merged, as in a GLM). iterations are
 * summed over the starts (two when the lapse rate is fitted), 0 when separation is found before iterating.
 */
export interface PsychometricFit {
  model: PsychometricModel;
  pse: number | null;
  se_pse: number | null;
  spread: number | null;
  se_spread: number | null;
  jnd: number | null;
  lapse: number | null;
  deviance: number;
  df: number;
  loglik: number;
  converged: boolean;
  iterations: number;
}

/** Internal parameters on the scaled axis u = (x − centre)/scale: η = alpha + beta·u. */
export interface PsychometricCore {
  theta: Float64Array; // [alpha, beta] or [alpha, beta, lambda]
  loglikKernel: number;
  converged: boolean;
  iterations: number;
  free: boolean[];
  expected: Float64Array;
  /** No finite maximum (separated data): theta is meaningless. */
  separated: boolean;
}

type Estimates = Pick<PsychometricFit, 'pse' | 'se_pse' | 'spread' | 'se_spread' | 'jnd' | 'lapse'>;

const LN3 = Math.log(3);

interface CdfValues {
  F: number;
  Q: number;
  f: number;
  df: number;
}

/** F, 1 − F, density and its derivative, each accurate in the tails. */
function cdfAt(model: PsychometricModel, eta: number, out: CdfValues): void {
  if (model === 'cumulative_gaussian') {
    const tail = upperTail(Math.abs(eta));
    if (eta < 0) {
      out.F = tail;
      out.Q = 1 - tail;
    } else {
      out.Q = tail;
      out.F = 1 - tail;
    }
    out.f = normalDensity(eta);
    out.df = -eta * out.f;
  } else {
    if (eta >= 0) {
      const e = Math.exp(-eta);
      out.F = 1 / (1 + e);
      out.Q = e / (1 + e);
    } else {
      const e = Math.exp(eta);
      out.F = e / (1 + e);
      out.Q = 1 / (1 + e);
    }
    out.f = out.F * out.Q;
    out.df = out.f * (out.Q - out.F);
  }
}

function checkOptions(input: PsychometricInput): { model: PsychometricModel; lapse: boolean; guess: number } {
  if (!PSYCHOMETRIC_MODELS.includes(input?.model)) {
    throw new PsychophysicsInputError(`model must be one of ${PSYCHOMETRIC_MODELS.join(', ')} (got ${String(input?.model)})`);
  }
  const lapse = input.lapse ?? false;
  if (typeof lapse !== 'boolean') throw new PsychophysicsInputError('lapse must be true or false');
  const guess = input.guess ?? 0;
  if (typeof guess !== 'number' || !(guess >= 0 && guess < 1 - LAPSE_MAX)) {
    throw new PsychophysicsInputError(`guess must be a number in [0, ${1 - LAPSE_MAX}) (got ${String(guess)})`);
  }
  return { model: input.model, lapse, guess };
}

/** One validated data set with its model, ready to be fitted (and refitted to bootstrap counts). */
export class PsychometricProblem {
  readonly model: PsychometricModel;
  readonly fitLapse: boolean;
  readonly guess: number;
  readonly counts: Counts;
  readonly u: Float64Array;
  readonly centre: number;
  readonly scale: number;
  readonly m: number;
  private readonly cdf: CdfValues = { F: 0, Q: 0, f: 0, df: 0 };
  private readonly dp = new Float64Array(3);
  private readonly d2 = new Float64Array(9);
  /** Rows pooled by distinct x (sorted), for the separation check. */
  private readonly levelOf: Int32Array;
  private readonly levelN: Float64Array;
  private readonly levelK: Float64Array;

  constructor(input: PsychometricInput) {
    const opts = checkOptions(input);
    this.model = opts.model;
    this.fitLapse = opts.lapse;
    this.guess = opts.guess;
    this.m = this.fitLapse ? 3 : 2;
    this.counts = validateCounts(input, this.m, 'fitPsychometric');
    this.centre = (this.counts.min + this.counts.max) / 2;
    this.scale = (this.counts.max - this.counts.min) / 2;
    this.u = this.counts.x.map((v) => (v - this.centre) / this.scale);
    const levels = [...new Set(this.counts.x)].sort((a, b) => a - b);
    const position = new Map(levels.map((v, j) => [v, j]));
    this.levelOf = Int32Array.from(this.counts.x, (v) => position.get(v)!);
    this.levelN = new Float64Array(levels.length);
    this.levelK = new Float64Array(levels.length);
    this.counts.n.forEach((ni, i) => (this.levelN[this.levelOf[i]] += ni));
  }

  /** Log-likelihood kernel, gradient, observed and expected information at theta for counts k. */
  evaluate(k: Float64Array, theta: Float64Array, out: Evaluation): void {
    const { u } = this;
    const n = this.counts.n;
    const m = this.m;
    const g = this.guess;
    const lambda = m === 3 ? theta[2] : 0;
    const c = 1 - g - lambda;
    const cv = this.cdf;
    out.grad.fill(0);
    out.observed.fill(0);
    out.expected.fill(0);
    let ll = 0;
    const { dp, d2 } = this;
    for (let i = 0; i < u.length; i++) {
      const ui = u[i];
      cdfAt(this.model, theta[0] + theta[1] * ui, cv);
      const p = g + c * cv.F;
      const q = c * cv.Q + lambda;
      const ki = k[i];
      const miss = n[i] - ki;
      if ((ki > 0 && !(p > 0)) || (miss > 0 && !(q > 0))) {
        out.loglik = -Infinity;
        return;
      }
      let r1 = 0;
      let s2 = 0;
      if (ki > 0) {
        ll += ki * Math.log(p);
        r1 += ki / p;
        s2 += ki / (p * p);
      }
      if (miss > 0) {
        ll += miss * Math.log(q);
        r1 -= miss / q;
        s2 += miss / (q * q);
      }
      const w = p > 0 && q > 0 ? n[i] / (p * q) : 0;
      dp[0] = c * cv.f;
      dp[1] = dp[0] * ui;
      const fpp = c * cv.df;
      d2[0] = fpp;
      d2[1] = d2[m] = fpp * ui;
      d2[m + 1] = fpp * ui * ui;
      if (m === 3) {
        dp[2] = -cv.F;
        d2[2] = d2[6] = -cv.f;
        d2[5] = d2[7] = -cv.f * ui;
        d2[8] = 0;
      }
      for (let a = 0; a < m; a++) {
        out.grad[a] += r1 * dp[a];
        for (let b = 0; b < m; b++) {
          const outer = dp[a] * dp[b];
          out.observed[a * m + b] += s2 * outer - r1 * d2[a * m + b];
          out.expected[a * m + b] += w * outer;
        }
      }
    }
    out.loglik = ll;
  }

  /** Fitted probabilities p and 1 − p at every row. */
  probabilities(theta: Float64Array): { p: Float64Array; q: Float64Array } {
    const len = this.u.length;
    const p = new Float64Array(len);
    const q = new Float64Array(len);
    const lambda = this.m === 3 ? theta[2] : 0;
    const c = 1 - this.guess - lambda;
    for (let i = 0; i < len; i++) {
      cdfAt(this.model, theta[0] + theta[1] * this.u[i], this.cdf);
      p[i] = this.guess + c * this.cdf.F;
      q[i] = c * this.cdf.Q + lambda;
    }
    return { p, q };
  }

  /**
   * No finite maximum: along increasing (or decreasing) x every level answers at or below the guess rate,
   * then at most one mixed level, then every level answers all "yes" (Albert & Anderson 1984, for grouped
   * data). Levels that share an x are pooled first.
   */
  separated(k: Float64Array): boolean {
    const { levelOf, levelN, levelK } = this;
    levelK.fill(0);
    for (let i = 0; i < k.length; i++) levelK[levelOf[i]] += k[i];
    const L = levelN.length;
    const low = (j: number) => levelK[j] <= this.guess * levelN[j];
    const high = (j: number) => levelK[j] === levelN[j];
    // increasing: low…low [one level] high…high
    let firstNotLow = 0;
    while (firstNotLow < L && low(firstNotLow)) firstNotLow++;
    let lastNotHigh = L - 1;
    while (lastNotHigh >= 0 && high(lastNotHigh)) lastNotHigh--;
    if (lastNotHigh <= firstNotLow) return true;
    // decreasing: high…high [one level] low…low
    let firstNotHigh = 0;
    while (firstNotHigh < L && high(firstNotHigh)) firstNotHigh++;
    let lastNotLow = L - 1;
    while (lastNotLow >= 0 && low(lastNotLow)) lastNotLow--;
    return lastNotLow <= firstNotHigh;
  }

  /** Start from one weighted least-squares step of the GLM on empirical proportions (k + ½)/(n + 1). */
  glmStart(k: Float64Array, lambda: number): Float64Array {
    const { u } = this;
    const n = this.counts.n;
    let sw = 0, swu = 0, swe = 0, swuu = 0, swue = 0;
    const c = 1 - this.guess - lambda;
    for (let i = 0; i < u.length; i++) {
      const mu = (k[i] + 0.5) / (n[i] + 1);
      const F = Math.min(0.98, Math.max(0.02, (mu - this.guess) / c));
      const logit = Math.log(F / (1 - F));
      const eta = this.model === 'cumulative_gaussian' ? logit / 1.702 : logit;
      const w = n[i] * F * (1 - F);
      sw += w;
      swu += w * u[i];
      swe += w * eta;
      swuu += w * u[i] * u[i];
      swue += w * u[i] * eta;
    }
    const det = sw * swuu - swu * swu;
    let beta = (sw * swue - swu * swe) / det;
    if (!Number.isFinite(beta) || Math.abs(beta) < 1e-3) beta = 1e-3;
    const alpha = (swe - beta * swu) / sw;
    return this.m === 3 ? Float64Array.of(alpha, beta, lambda) : Float64Array.of(alpha, beta);
  }

  /**
   * Maximum-likelihood fit to counts k (the data's own, or a bootstrap sample), optionally from given starts;
   * `refit` (bootstrap) stops one Newton step early within 1e-5 SEs of the maximum (only theta is then used).
   */
  fit(k: Float64Array, starts?: Float64Array[], refit = false): PsychometricCore {
    if (this.separated(k)) {
      return { theta: new Float64Array(this.m), loglikKernel: NaN, converged: false, iterations: 0, free: [], expected: new Float64Array(0), separated: true };
    }
    const bounds: Bound[] = this.m === 3 ? [{ index: 2, lower: 0, upper: LAPSE_MAX }] : [];
    const evaluate = (theta: Float64Array, out: Evaluation) => this.evaluate(k, theta, out);
    // in scaled units a slope beyond 1e4 is a step function: the data are separated up to the lapses
    const diverged = (theta: Float64Array) => !(Math.abs(theta[1]) < 1e4 && Math.abs(theta[0]) < 1e4);
    const candidates = starts ?? (this.m === 3 ? [this.glmStart(k, 0), this.glmStart(k, 0.05)] : [this.glmStart(k, 0)]);
    let best: MaximiseResult | null = null;
    let iterations = 0;
    for (const start of candidates) {
      const r = maximise(start, this.m, evaluate, bounds, { diverged, skipLastEvaluation: refit });
      iterations += r.iterations;
      if (!best || (r.converged && !best.converged) || (r.converged === best.converged && r.loglik > best.loglik)) best = r;
    }
    const b = best!;
    return { theta: b.theta, loglikKernel: b.loglik, converged: b.converged, iterations, free: b.free, expected: b.at.expected, separated: false };
  }

  /** The contract's result for a fit to counts k. */
  result(k: Float64Array, core: PsychometricCore): PsychometricFit {
    const { n } = this.counts;
    const out = (est: Estimates | null, deviance: number, loglik: number): PsychometricFit => ({
      model: this.model,
      pse: est?.pse ?? null,
      se_pse: est?.se_pse ?? null,
      spread: est?.spread ?? null,
      se_spread: est?.se_spread ?? null,
      jnd: est?.jnd ?? null,
      lapse: est?.lapse ?? null,
      deviance,
      df: n.length - this.m,
      loglik,
      converged: est !== null,
      iterations: core.iterations,
    });
    if (core.separated) {
      // the supremum: each level at its own best probability within [guess, 1]
      const p = Float64Array.from(n, (ni, i) => Math.max(this.guess, k[i] / ni));
      const q = Float64Array.from(p, (v) => 1 - v);
      return out(null, binomialDeviance(n, k, p, q), kernelLoglik(n, k, p, q) + logChooseSum(n, k));
    }
    const { p, q } = this.probabilities(core.theta);
    const deviance = binomialDeviance(n, k, p, q);
    const loglik = core.loglikKernel + logChooseSum(n, k);
    return out(core.converged ? this.estimates(core) : null, deviance, loglik);
  }

  /** pse, spread, jnd, lapse and the delta-method SEs from the expected information over the free parameters. */
  estimates(core: PsychometricCore): Estimates {
    const [alpha, beta] = core.theta;
    const h = this.scale;
    const m = this.m;
    const spread = h / beta;
    let sePse: number | null = null;
    let seSpread: number | null = null;
    const cov = inverseOn(core.expected, m, core.free.flatMap((f, i) => (f ? [i] : [])));
    if (cov) {
      // delta method: ∂pse/∂(α, β) = (−h/β, hα/β²), ∂spread/∂β = −h/β²
      const ga = -h / beta;
      const gb = (h * alpha) / (beta * beta);
      const vPse = ga * ga * cov[0] + 2 * ga * gb * cov[1] + gb * gb * cov[m + 1];
      const vSpread = ((h * h) / beta ** 4) * cov[m + 1];
      sePse = Number.isFinite(vPse) && vPse >= 0 ? Math.sqrt(vPse) : null;
      seSpread = Number.isFinite(vSpread) && vSpread >= 0 ? Math.sqrt(vSpread) : null;
    }
    return {
      pse: this.centre - (h * alpha) / beta,
      se_pse: sePse,
      spread,
      se_spread: seSpread,
      jnd: spread * (this.model === 'cumulative_gaussian' ? PROBIT_Z75 : LN3),
      lapse: m === 3 ? core.theta[2] : 0,
    };
  }
}

/** Binomial maximum-likelihood psychometric function; see PsychometricFit for what comes back. */
export function fitPsychometric(input: PsychometricInput): PsychometricFit {
  const problem = new PsychometricProblem(input);
  const k = problem.counts.k;
  return problem.result(k, problem.fit(k));
}
