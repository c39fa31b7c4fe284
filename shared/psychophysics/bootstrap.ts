// Parametric bootstrap of a fit (Wichmann & Hill 2001b): counts drawn from the fitted curve at every level
// with the data's numbers of trials, refitted with the same model, and percentile intervals of every parameter.
import { PsychometricProblem, PROBIT_Z75, type PsychometricFit, type PsychometricInput } from './psychometric.js';
import { SimultaneityProblem, type SimultaneityFit, type SimultaneityInput } from './simultaneity.js';
import { binomialDraw, createRandom, type Random } from './random.js';
import { PsychophysicsInputError } from './validate.js';

export interface BootstrapOptions {
  /** Number of simulated data sets (default 1000). */
  resamples?: number;
  /** Seed of the random stream, an unsigned 32-bit integer (default 1): the same seed gives the same result. */
  seed?: number;
  /** Coverage of the percentile intervals (default 0.95). */
  level?: number;
}

/**
 * Percentile interval (R's quantile type 7) of the converged refits, their SD, and how many refits gave a
 * value (`usable`: converged, and for width a peak ≥ 0.5). Null bounds when no refit gave a value.
 */
export interface BootstrapInterval {
  lower: number | null;
  upper: number | null;
  sd: number | null;
  usable: number;
}

interface BootstrapCommon {
  resamples: number;
  /** Refits that did not converge (for instance a simulated data set with perfect separation): left out. */
  failed: number;
  seed: number;
  level: number;
}

export interface PsychometricBootstrap extends BootstrapCommon {
  kind: 'psychometric';
  fit: PsychometricFit;
  /** lapse is null unless the lapse rate was fitted. */
  ci: { pse: BootstrapInterval; spread: BootstrapInterval; jnd: BootstrapInterval; lapse: BootstrapInterval | null };
}

export interface SimultaneityBootstrap extends BootstrapCommon {
  kind: 'simultaneity';
  fit: SimultaneityFit;
  ci: { centre: BootstrapInterval; width: BootstrapInterval; amplitude: BootstrapInterval; sigma: BootstrapInterval };
}

export type BootstrapResult = PsychometricBootstrap | SimultaneityBootstrap;
/** The result type for an input type: an input with a model is a psychometric one. */
export type BootstrapOf<T> = T extends { model: unknown } ? PsychometricBootstrap : SimultaneityBootstrap;

function quantileSorted(s: Float64Array, prob: number): number {
  const h = (s.length - 1) * prob;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, s.length - 1);
  return s[lo] + (h - lo) * (s[hi] - s[lo]);
}

function interval(values: number[], level: number): BootstrapInterval {
  const usable = values.length;
  if (usable === 0) return { lower: null, upper: null, sd: null, usable };
  const s = Float64Array.from(values).sort();
  let mean = 0;
  for (const v of s) mean += v;
  mean /= usable;
  let ss = 0;
  for (const v of s) ss += (v - mean) ** 2;
  const alpha = (1 - level) / 2;
  return { lower: quantileSorted(s, alpha), upper: quantileSorted(s, 1 - alpha), sd: usable > 1 ? Math.sqrt(ss / (usable - 1)) : null, usable };
}

function checkOptions(options: BootstrapOptions | undefined) {
  const resamples = options?.resamples ?? 1000;
  const seed = options?.seed ?? 1;
  const level = options?.level ?? 0.95;
  if (!Number.isInteger(resamples) || resamples < 1 || resamples > 1_000_000) {
    throw new PsychophysicsInputError(`resamples must be a whole number from 1 to 1,000,000 (got ${String(resamples)})`);
  }
  if (!Number.isInteger(seed) || seed < 0 || seed > 0xffffffff) {
    throw new PsychophysicsInputError(`seed must be a whole number from 0 to 4294967295 (got ${String(seed)})`);
  }
  if (typeof level !== 'number' || !(level > 0 && level < 1)) throw new PsychophysicsInputError(`level must be in (0, 1) (got ${String(level)})`);
  return { resamples, seed, level };
}

function simulate(n: Float64Array, p: Float64Array, rnd: Random, out: Float64Array): void {
  for (let i = 0; i < n.length; i++) out[i] = binomialDraw(n[i], p[i], rnd);
}

function bootstrapPsychometric(input: PsychometricInput, resamples: number, seed: number, level: number): PsychometricBootstrap {
  const problem = new PsychometricProblem(input);
  const data = problem.counts.k;
  const core = problem.fit(data);
  const fit = problem.result(data, core);
  const lapse = problem.fitLapse;
  const draws = { pse: [] as number[], spread: [] as number[], jnd: [] as number[], lapse: [] as number[] };
  let failed = 0;
  if (fit.converged) {
    const { p } = problem.probabilities(core.theta);
    const rnd = createRandom(seed);
    const k = new Float64Array(p.length);
    const unit = problem.model === 'cumulative_gaussian' ? PROBIT_Z75 : Math.log(3);
    for (let r = 0; r < resamples; r++) {
      simulate(problem.counts.n, p, rnd, k);
      const refit = problem.fit(k, lapse ? [core.theta, problem.glmStart(k, 0)] : [core.theta], true);
      if (!refit.converged) {
        failed++;
        continue;
      }
      const [alpha, beta] = refit.theta;
      const spread = problem.scale / beta;
      draws.pse.push(problem.centre - alpha * spread);
      draws.spread.push(spread);
      draws.jnd.push(spread * unit);
      if (lapse) draws.lapse.push(refit.theta[2]);
    }
  } else {
    failed = resamples;
  }
  return {
    kind: 'psychometric',
    fit,
    resamples,
    failed,
    seed,
    level,
    ci: {
      pse: interval(draws.pse, level),
      spread: interval(draws.spread, level),
      jnd: interval(draws.jnd, level),
      lapse: lapse ? interval(draws.lapse, level) : null,
    },
  };
}

function bootstrapSimultaneity(input: SimultaneityInput, resamples: number, seed: number, level: number): SimultaneityBootstrap {
  const problem = new SimultaneityProblem(input);
  const data = problem.counts.k;
  const core = problem.fit(data);
  const fit = problem.result(data, core);
  const draws = { centre: [] as number[], width: [] as number[], amplitude: [] as number[], sigma: [] as number[] };
  let failed = 0;
  if (fit.converged) {
    const { p } = problem.probabilities(core.theta);
    const rnd = createRandom(seed);
    const k = new Float64Array(p.length);
    for (let r = 0; r < resamples; r++) {
      simulate(problem.counts.n, p, rnd, k);
      const refit = problem.degenerate(k) ? null : problem.fit(k, [core.theta, problem.dataStarts(k)[0]], true);
      if (!refit?.converged) {
        failed++;
        continue;
      }
      const [mu, s, A] = refit.theta;
      const sigma = problem.scale * Math.exp(s);
      draws.centre.push(problem.centre + problem.scale * mu);
      draws.sigma.push(sigma);
      draws.amplitude.push(A);
      if (A >= 0.5) draws.width.push(2 * sigma * Math.sqrt(2 * Math.log(2 * A)));
    }
  } else {
    failed = resamples;
  }
  return {
    kind: 'simultaneity',
    fit,
    resamples,
    failed,
    seed,
    level,
    ci: {
      centre: interval(draws.centre, level),
      width: interval(draws.width, level),
      amplitude: interval(draws.amplitude, level),
      sigma: interval(draws.sigma, level),
    },
  };
}

/**
 * Parametric bootstrap of fitPsychometric (an input with a `model`) or fitSimultaneity (an input without one).
 * When the fit to the data does not converge there is no curve to simulate from: every refit counts as failed
 * and the intervals are null.
 */
export function bootstrapFit<T extends PsychometricInput | SimultaneityInput>(fitInput: T, options?: BootstrapOptions): BootstrapOf<T> {
  const { resamples, seed, level } = checkOptions(options);
  if (fitInput === null || typeof fitInput !== 'object') throw new PsychophysicsInputError('bootstrapFit needs the input of fitPsychometric or fitSimultaneity');
  const result: BootstrapResult =
    'model' in fitInput
      ? bootstrapPsychometric(fitInput as PsychometricInput, resamples, seed, level)
      : bootstrapSimultaneity(fitInput, resamples, seed, level);
  return result as BootstrapOf<T>;
}
