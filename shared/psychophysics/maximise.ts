/**
 * Bounded maximisation of a log-likelihood with at most three parameters: Newton steps on the observed
 * information when it is positive definite, Fisher scoring on the expected information otherwise, step-halving
 * until the log-likelihood does not fall, and an active set for parameters held at a bound (a bound is left
 * only when the gradient points inside). Converged means the Newton decrement gᵀI⁻¹g on the expected
 * information over the free parameters is below `tolerance`: the remaining step is that many squared
 * standard errors, and the Karush–Kuhn–Tucker conditions hold at the bounds.
 */
export interface Bound {
  index: number;
  lower: number;
  upper: number;
  /** The lower bound is never reached (an open interval): steps stop part of the way to it. */
  openLower?: boolean;
}

/** What an evaluation fills in: m-vector gradient, m×m (row-major) observed and expected information. */
export interface Evaluation {
  loglik: number;
  grad: Float64Array;
  observed: Float64Array;
  expected: Float64Array;
}

/** Sets out.loglik to −Infinity where the parameters give a zero probability to an observed count. */
export type Evaluate = (theta: Float64Array, out: Evaluation) => void;

export interface MaximiseOptions {
  maxIterations?: number;
  tolerance?: number;
  /** True when the iterate has run off to where no finite maximum is expected. */
  diverged?: (theta: Float64Array) => boolean;
  /**
   * Stop one Newton step early: once within 1e-5 standard errors (decrement < 1e-10), take the Newton step
   * and return it without evaluating there (loglik and `at` then belong to the point before that step).
   * For bootstrap refits, which need only the estimates.
   */
  skipLastEvaluation?: boolean;
}

export interface MaximiseResult {
  theta: Float64Array;
  loglik: number;
  converged: boolean;
  iterations: number;
  /** Parameters not held at a bound at the end. */
  free: boolean[];
  /** The evaluation at theta (gradient and information). */
  at: Evaluation;
}

export function newEvaluation(m: number): Evaluation {
  return { loglik: -Infinity, grad: new Float64Array(m), observed: new Float64Array(m * m), expected: new Float64Array(m * m) };
}

/** Cholesky factor (3×3 storage) of the sub-matrix a[idx, idx]; false unless clearly positive definite. */
function cholesky(a: Float64Array, m: number, idx: number[], L: Float64Array): boolean {
  const f = idx.length;
  for (let i = 0; i < f; i++) {
    for (let j = 0; j <= i; j++) {
      let s = a[idx[i] * m + idx[j]];
      for (let r = 0; r < j; r++) s -= L[i * 3 + r] * L[j * 3 + r];
      if (i === j) {
        if (!(s > 1e-14 * Math.abs(a[idx[i] * m + idx[i]]) && s > 0)) return false;
        L[i * 3 + i] = Math.sqrt(s);
      } else {
        L[i * 3 + j] = s / L[j * 3 + j];
      }
    }
  }
  return true;
}

function choleskySolve(L: Float64Array, f: number, b: Float64Array, out: Float64Array): void {
  for (let i = 0; i < f; i++) {
    let s = b[i];
    for (let r = 0; r < i; r++) s -= L[i * 3 + r] * out[r];
    out[i] = s / L[i * 3 + i];
  }
  for (let i = f - 1; i >= 0; i--) {
    let s = out[i];
    for (let r = i + 1; r < f; r++) s -= L[r * 3 + i] * out[r];
    out[i] = s / L[i * 3 + i];
  }
}

/**
 * Inverse of the sub-matrix a[idx, idx] (a covariance from an information matrix), as a full m×m matrix
 * with zeros in the rows and columns not in idx; null unless positive definite.
 */
export function inverseOn(a: Float64Array, m: number, idx: number[]): Float64Array | null {
  const L = new Float64Array(9);
  if (!cholesky(a, m, idx, L)) return null;
  const f = idx.length;
  const out = new Float64Array(m * m);
  const e = new Float64Array(3);
  const col = new Float64Array(3);
  for (let c = 0; c < f; c++) {
    e.fill(0);
    e[c] = 1;
    choleskySolve(L, f, e, col);
    for (let r = 0; r < f; r++) out[idx[r] * m + idx[c]] = col[r];
  }
  return out;
}

interface Scratch {
  theta: Float64Array;
  trial: Float64Array;
  cur: Evaluation;
  next: Evaluation;
  L: Float64Array;
  g: Float64Array;
  d: Float64Array;
  free: boolean[];
}

// maximise is not re-entrant, so one set of buffers per dimension serves every call
const scratch = new Map<number, Scratch>();
function scratchFor(m: number): Scratch {
  let s = scratch.get(m);
  if (!s) {
    s = {
      theta: new Float64Array(m),
      trial: new Float64Array(m),
      cur: newEvaluation(m),
      next: newEvaluation(m),
      L: new Float64Array(9),
      g: new Float64Array(3),
      d: new Float64Array(3),
      free: new Array<boolean>(m).fill(true),
    };
    scratch.set(m, s);
  }
  return s;
}

/** -1 at a closed lower bound, 1 at the upper bound, 0 inside. */
function side(b: Bound, v: number): number {
  return v <= b.lower && !b.openLower ? -1 : v >= b.upper ? 1 : 0;
}

export function maximise(start: ArrayLike<number>, m: number, evaluate: Evaluate, bounds: Bound[], options: MaximiseOptions = {}): MaximiseResult {
  const maxIterations = options.maxIterations ?? 100;
  const tolerance = options.tolerance ?? 1e-18;
  const s = scratchFor(m);
  let { theta, trial, cur, next } = s;
  const { L, g, d, free } = s;
  const idx: number[] = [];
  theta.set(start);
  evaluate(theta, cur);
  const done = (converged: boolean, iterations: number): MaximiseResult => {
    const at = newEvaluation(m);
    at.loglik = cur.loglik;
    at.grad.set(cur.grad);
    at.observed.set(cur.observed);
    at.expected.set(cur.expected);
    s.theta = theta;
    s.trial = trial;
    s.cur = cur;
    s.next = next;
    return { theta: Float64Array.from(theta), loglik: cur.loglik, converged, iterations, free: free.slice(), at };
  };
  if (!Number.isFinite(cur.loglik)) return done(false, 0);
  for (let iter = 1; iter <= maxIterations; iter++) {
    // free set by the sign of the gradient at the bounds (KKT)
    free.fill(true);
    for (const b of bounds) {
      const at = side(b, theta[b.index]);
      if ((at < 0 && cur.grad[b.index] <= 0) || (at > 0 && cur.grad[b.index] >= 0)) free[b.index] = false;
    }
    idx.length = 0;
    for (let i = 0; i < m; i++) if (free[i]) idx.push(i);
    if (idx.length === 0) return done(true, iter - 1);
    if (!cholesky(cur.expected, m, idx, L)) return done(false, iter - 1);
    for (let i = 0; i < idx.length; i++) g[i] = cur.grad[idx[i]];
    choleskySolve(L, idx.length, g, d);
    let decrement = 0;
    for (let i = 0; i < idx.length; i++) decrement += g[i] * d[i];
    if (decrement <= tolerance) return done(true, iter - 1);

    // direction: Newton where the observed information is positive definite, else scoring; a parameter at a
    // bound whose step would leave the feasible region is held for this iteration
    let newton = false;
    for (let pass = 0; pass <= bounds.length; pass++) {
      for (let i = 0; i < idx.length; i++) g[i] = cur.grad[idx[i]];
      newton = cholesky(cur.observed, m, idx, L);
      if (newton || cholesky(cur.expected, m, idx, L)) choleskySolve(L, idx.length, g, d);
      else return done(false, iter - 1);
      let outward = -1;
      for (const b of bounds) {
        const pos = idx.indexOf(b.index);
        if (pos < 0) continue;
        const at = side(b, theta[b.index]);
        if ((at < 0 && d[pos] < 0) || (at > 0 && d[pos] > 0)) outward = pos;
      }
      if (outward < 0) break;
      idx.splice(outward, 1);
      if (idx.length === 0) return done(false, iter - 1);
    }

    let tMax = Infinity;
    let hitIndex = -1;
    let hitValue = 0;
    let hitOpen = false;
    for (const b of bounds) {
      const pos = idx.indexOf(b.index);
      if (pos < 0) continue;
      const v = theta[b.index];
      const step = d[pos];
      let t = Infinity;
      if (step > 0 && Number.isFinite(b.upper)) t = (b.upper - v) / step;
      else if (step < 0 && Number.isFinite(b.lower)) t = ((b.openLower ? 0.9 : 1) * (v - b.lower)) / -step;
      if (t < tMax) {
        tMax = t;
        hitIndex = b.index;
        hitValue = step > 0 ? b.upper : b.lower;
        hitOpen = step < 0 && !!b.openLower;
      }
    }
    if (options.skipLastEvaluation && newton && decrement < 1e-10 && tMax > 1) {
      for (let i = 0; i < idx.length; i++) theta[idx[i]] += d[i];
      return done(true, iter);
    }
    let t = Math.min(1, tMax);
    let accepted = false;
    // within 1e-4 standard errors of the maximum the change in log-likelihood is below its rounding: take the step
    const trustStep = decrement < 1e-8;
    for (let halving = 0; halving < 60; halving++) {
      trial.set(theta);
      for (let i = 0; i < idx.length; i++) trial[idx[i]] += t * d[i];
      if (hitIndex >= 0 && t === tMax && !hitOpen) trial[hitIndex] = hitValue;
      evaluate(trial, next);
      if (next.loglik >= cur.loglik || (trustStep && Number.isFinite(next.loglik))) {
        accepted = true;
        break;
      }
      t *= 0.5;
    }
    if (!accepted) return done(false, iter);
    [theta, trial] = [trial, theta];
    [cur, next] = [next, cur];
    if (options.diverged?.(theta)) return done(false, iter);
  }
  return done(false, maxIterations);
}
