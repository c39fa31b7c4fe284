/** A bad input to a psychophysics fit: the message says which field and why. */
export class PsychophysicsInputError extends Error {
  constructor(message: string) {
    super(message);
    this.name = 'PsychophysicsInputError';
  }
}

export interface CountsInput {
  x: ArrayLike<number>;
  n: ArrayLike<number>;
  k: ArrayLike<number>;
}

export interface Counts {
  x: Float64Array;
  n: Float64Array;
  k: Float64Array;
  /** Number of distinct stimulus levels. */
  distinct: number;
  min: number;
  max: number;
}

const isArrayLike = (v: unknown): v is ArrayLike<number> =>
  Array.isArray(v) || (ArrayBuffer.isView(v) && !(v instanceof DataView));

/** Checks one row per stimulus level: finite x, whole n ≥ 1, whole k in [0, n], at least `minLevels` distinct x. */
export function validateCounts(input: CountsInput, minLevels: number, what: string): Counts {
  if (input === null || typeof input !== 'object') throw new PsychophysicsInputError(`${what} needs an object { x, n, k }`);
  for (const f of ['x', 'n', 'k'] as const) {
    if (!isArrayLike(input[f])) throw new PsychophysicsInputError(`${f} must be an array of numbers`);
  }
  const m = input.x.length;
  if (input.n.length !== m || input.k.length !== m) {
    throw new PsychophysicsInputError(`x, n and k must have the same length (got ${m}, ${input.n.length}, ${input.k.length})`);
  }
  if (m === 0) throw new PsychophysicsInputError('x, n and k are empty: give one row per stimulus level');
  const x = new Float64Array(m);
  const n = new Float64Array(m);
  const k = new Float64Array(m);
  for (let i = 0; i < m; i++) {
    const xi = input.x[i];
    const ni = input.n[i];
    const ki = input.k[i];
    if (typeof xi !== 'number' || !Number.isFinite(xi)) throw new PsychophysicsInputError(`x[${i}] must be a finite number (got ${String(xi)})`);
    if (typeof ni !== 'number' || !Number.isInteger(ni) || ni < 1) {
      throw new PsychophysicsInputError(`n[${i}] must be a whole number of trials ≥ 1 (got ${String(ni)})`);
    }
    if (typeof ki !== 'number' || !Number.isInteger(ki) || ki < 0 || ki > ni) {
      throw new PsychophysicsInputError(`k[${i}] must be a whole count between 0 and n[${i}] = ${ni} (got ${String(ki)})`);
    }
    x[i] = xi;
    n[i] = ni;
    k[i] = ki;
  }
  const distinct = new Set(x).size;
  if (distinct < minLevels) {
    throw new PsychophysicsInputError(
      `${what} needs at least ${minLevels} distinct stimulus levels (got ${distinct}): its parameters are not identifiable from fewer`,
    );
  }
  let min = Infinity;
  let max = -Infinity;
  for (const v of x) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { x, n, k, distinct, min, max };
}
