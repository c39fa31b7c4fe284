// Simultaneity judgements: a scaled Gaussian window p(x) = A·exp(−(x − μ)²/(2σ²)), 0 < A ≤ 1, fitted by
// binomial maximum likelihood from several starts.
import { binomialDeviance, kernelLoglik, logChooseSum } from './binomial.js';
import { inverseOn, maximise, type Bound, type Evaluation, type MaximiseResult } from './maximise.js';
import { validateCounts, type Counts, type CountsInput } from './validate.js';

export type SimultaneityInput = CountsInput;

/**
 * centre = μ, sigma = σ (x's unit), amplitude = A; width = the length of the x range where p ≥ 0.5,
 * 2σ·√(2 ln 2A), null when A < 0.5. SEs by the delta method from the expected information (A held at 1 when
 * the maximum is on that bound). When no finite maximum exists (no "simultaneous" answers, all answers
 * "simultaneous", or only one level with any) or the iteration fails, converged is false and the estimates
 * are null; deviance and loglik are then the supremum (those cases) or the last iterate's.
 */
export interface SimultaneityFit {
  centre: number | null;
  se_centre: number | null;
  width: number | null;
  se_width: number | null;
  amplitude: number | null;
  sigma: number | null;
  deviance: number;
  df: number;
  loglik: number;
  converged: boolean;
}

export interface SimultaneityCore {
  theta: Float64Array; // [mu, ln sigma, A] on the scaled axis
  loglikKernel: number;
  converged: boolean;
  iterations: number;
  free: boolean[];
  expected: Float64Array;
  degenerate: boolean;
}

const BOUNDS: Bound[] = [{ index: 2, lower: 0, upper: 1, openLower: true }];
const diverged = (theta: Float64Array) => !(Math.abs(theta[0]) < 1e3 && theta[1] < Math.log(1e3) && theta[1] > Math.log(1e-6));

export class SimultaneityProblem {
  readonly counts: Counts;
  readonly u: Float64Array;
  readonly centre: number;
  readonly scale: number;
  private readonly dp = new Float64Array(3);
  private readonly d2 = new Float64Array(9);

  constructor(input: SimultaneityInput) {
    this.counts = validateCounts(input, 3, 'fitSimultaneity');
    this.centre = (this.counts.min + this.counts.max) / 2;
    this.scale = (this.counts.max - this.counts.min) / 2;
    this.u = this.counts.x.map((v) => (v - this.centre) / this.scale);
  }

  evaluate(k: Float64Array, theta: Float64Array, out: Evaluation): void {
    const { u } = this;
    const n = this.counts.n;
    const mu = theta[0];
    const sigma = Math.exp(theta[1]);
    const A = theta[2];
    out.grad.fill(0);
    out.observed.fill(0);
    out.expected.fill(0);
    let ll = 0;
    const { dp, d2 } = this;
    for (let i = 0; i < u.length; i++) {
      const z = (u[i] - mu) / sigma;
      const h = -0.5 * z * z;
      const G = Math.exp(h);
      const p = A * G;
      const q = 1 - A + A * -Math.expm1(h);
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
      const z2 = z * z;
      dp[0] = (p * z) / sigma;
      dp[1] = p * z2;
      dp[2] = G;
      d2[0] = (p * (z2 - 1)) / (sigma * sigma);
      d2[1] = d2[3] = (p * (z2 * z - 2 * z)) / sigma;
      d2[4] = p * (z2 * z2 - 2 * z2);
      d2[2] = d2[6] = (G * z) / sigma;
      d2[5] = d2[7] = G * z2;
      d2[8] = 0;
      for (let a = 0; a < 3; a++) {
        out.grad[a] += r1 * dp[a];
        for (let b = 0; b < 3; b++) {
          const outer = dp[a] * dp[b];
          out.observed[a * 3 + b] += s2 * outer - r1 * d2[a * 3 + b];
          out.expected[a * 3 + b] += w * outer;
        }
      }
    }
    out.loglik = ll;
  }

  probabilities(theta: Float64Array): { p: Float64Array; q: Float64Array } {
    const len = this.u.length;
    const p = new Float64Array(len);
    const q = new Float64Array(len);
    const sigma = Math.exp(theta[1]);
    const A = theta[2];
    for (let i = 0; i < len; i++) {
      const z = (this.u[i] - theta[0]) / sigma;
      const h = -0.5 * z * z;
      p[i] = A * Math.exp(h);
      q[i] = 1 - A + A * -Math.expm1(h);
    }
    return { p, q };
  }

  /** No finite maximum: no level with a "simultaneous" answer but one, or every answer "simultaneous". */
  degenerate(k: Float64Array): boolean {
    const { n } = this.counts;
    const withAny = new Set<number>();
    let all = true;
    for (let i = 0; i < k.length; i++) {
      if (k[i] > 0) withAny.add(this.counts.x[i]);
      if (k[i] !== n[i]) all = false;
    }
    return withAny.size <= 1 || all;
  }

  /** Starts from the data: the answer-weighted mean and SD of x, the most-answered level, wide and narrow windows. */
  dataStarts(k: Float64Array): Float64Array[] {
    const { u } = this;
    const n = this.counts.n;
    let sw = 0, swu = 0, swuu = 0, peak = 0, peakU = 0;
    for (let i = 0; i < u.length; i++) {
      const prop = k[i] / n[i];
      sw += prop;
      swu += prop * u[i];
      swuu += prop * u[i] * u[i];
      if (prop > peak) {
        peak = prop;
        peakU = u[i];
      }
    }
    const mean = swu / sw;
    const sd = Math.sqrt(Math.max(swuu / sw - mean * mean, 0));
    const A = Math.min(0.98, Math.max(0.05, peak));
    const spreadStart = Math.min(2, Math.max(0.05, sd));
    return [
      Float64Array.of(mean, Math.log(spreadStart), A),
      Float64Array.of(peakU, Math.log(0.5), A),
      Float64Array.of(mean, Math.log(0.15), A),
      Float64Array.of(peakU, Math.log(1.5), A),
    ];
  }

  /** Maximum-likelihood fit to counts k from several starts; `refit` as in PsychometricProblem.fit. */
  fit(k: Float64Array, starts?: Float64Array[], refit = false): SimultaneityCore {
    if (this.degenerate(k)) {
      return { theta: new Float64Array(3), loglikKernel: NaN, converged: false, iterations: 0, free: [], expected: new Float64Array(0), degenerate: true };
    }
    const evaluate = (theta: Float64Array, out: Evaluation) => this.evaluate(k, theta, out);
    let best: MaximiseResult | null = null;
    let iterations = 0;
    for (const start of starts ?? this.dataStarts(k)) {
      const r = maximise(start, 3, evaluate, BOUNDS, { diverged, maxIterations: 200, skipLastEvaluation: refit });
      iterations += r.iterations;
      if (!best || (r.converged && !best.converged) || (r.converged === best.converged && r.loglik > best.loglik)) best = r;
    }
    const b = best!;
    return { theta: b.theta, loglikKernel: b.loglik, converged: b.converged, iterations, free: b.free, expected: b.at.expected, degenerate: false };
  }

  result(k: Float64Array, core: SimultaneityCore): SimultaneityFit {
    const { n } = this.counts;
    const df = n.length - 3;
    const empty = { centre: null, se_centre: null, width: null, se_width: null, amplitude: null, sigma: null };
    if (core.degenerate) {
      const p = Float64Array.from(n, (ni, i) => k[i] / ni);
      const q = Float64Array.from(p, (v) => 1 - v);
      return { ...empty, deviance: binomialDeviance(n, k, p, q), df, loglik: kernelLoglik(n, k, p, q) + logChooseSum(n, k), converged: false };
    }
    const { p, q } = this.probabilities(core.theta);
    const deviance = binomialDeviance(n, k, p, q);
    const loglik = core.loglikKernel + logChooseSum(n, k);
    if (!core.converged) return { ...empty, deviance, df, loglik, converged: false };
    const h = this.scale;
    const [mu, s, A] = core.theta;
    const sigma = h * Math.exp(s);
    const width = A >= 0.5 ? 2 * sigma * Math.sqrt(2 * Math.log(2 * A)) : null;
    const cov = inverseOn(core.expected, 3, core.free.flatMap((f, i) => (f ? [i] : [])));
    let seCentre: number | null = null;
    let seWidth: number | null = null;
    if (cov) {
      const vc = h * h * cov[0];
      seCentre = Number.isFinite(vc) && vc >= 0 ? Math.sqrt(vc) : null;
      if (width !== null && width > 0) {
        // delta method: ∂w/∂ln σ = w, ∂w/∂A = w / (2A ln 2A)
        const gA = width / (2 * A * Math.log(2 * A));
        const vw = width * width * cov[4] + 2 * width * gA * cov[5] + gA * gA * cov[8];
        seWidth = Number.isFinite(vw) && vw >= 0 ? Math.sqrt(vw) : null;
      }
    }
    return {
      centre: this.centre + h * mu,
      se_centre: seCentre,
      width,
      se_width: seWidth,
      amplitude: A,
      sigma,
      deviance,
      df,
      loglik,
      converged: true,
    };
  }
}

/** Binomial maximum-likelihood simultaneity window; see SimultaneityFit for what comes back. */
export function fitSimultaneity(input: SimultaneityInput): SimultaneityFit {
  const problem = new SimultaneityProblem(input);
  const k = problem.counts.k;
  return problem.result(k, problem.fit(k));
}
