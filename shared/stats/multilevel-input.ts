import { StatsInputError } from './errors.js';
import { cholesky } from './small-symmetric.js';
import type { NumericArray } from './types.js';

export type ClusterId = string | number;
export type MultilevelTest = 'z' | 't';

export interface MultilevelInput {
  effects: NumericArray;
  variances: NumericArray;
  /** the paper (reference) each effect comes from, one entry per effect; compared with === (1 and "1" differ) */
  cluster: ArrayLike<ClusterId>;
  /** numeric moderator columns, each with one value per effect */
  moderators?: NumericArray[];
  /** confidence level of every interval; default 0.95 */
  level?: number;
  /** "z" (default) or "t" with k − p degrees of freedom */
  test?: MultilevelTest;
}

/**
 * The data regrouped by cluster: effects of cluster j occupy positions start[j] … start[j + 1] − 1.
 * y is shifted by `shift` (the first effect) so identical effects give residuals of exactly 0; the
 * intercept absorbs the shift. x is the k×p design (intercept first), row-major.
 */
export interface ClusteredData {
  k: number;
  p: number;
  clusters: number;
  y: Float64Array;
  v: Float64Array;
  x: Float64Array;
  start: Int32Array;
  shift: number;
  /** true when the input gave a moderators array (then coefficients are reported) */
  withModerators: boolean;
  level: number;
  test: MultilevelTest;
  /** largest cluster size */
  maxSize: number;
}

function numbers(values: unknown, name: string): ArrayLike<unknown> {
  if (!Array.isArray(values) && !ArrayBuffer.isView(values))
    throw new StatsInputError(`${name} must be an array of numbers`, name);
  return values as unknown as ArrayLike<unknown>;
}

/** Checks the input of poolMultilevel / robustPool and groups the effects by cluster. */
export function prepareMultilevel(input: unknown, who: 'poolMultilevel' | 'robustPool'): ClusteredData {
  if (input === null || typeof input !== 'object')
    throw new StatsInputError('input must be an object with effects, variances and cluster');
  const obj = input as Partial<MultilevelInput>;
  const level = obj.level ?? 0.95;
  if (typeof level !== 'number' || !(level > 0 && level < 1))
    throw new StatsInputError('level must be a number strictly between 0 and 1', 'level');
  const test = obj.test ?? 'z';
  if (test !== 'z' && test !== 't') throw new StatsInputError(`test must be "z" or "t" (got ${JSON.stringify(obj.test)})`, 'test');

  const effects = numbers(obj.effects, 'effects');
  const variances = numbers(obj.variances, 'variances');
  const k = effects.length;
  if (variances.length !== k)
    throw new StatsInputError(`effects and variances must have the same length (got ${k} and ${variances.length})`, 'variances');
  if (obj.cluster === undefined || obj.cluster === null || typeof obj.cluster !== 'object' || typeof obj.cluster.length !== 'number')
    throw new StatsInputError('cluster must be an array with the paper of each effect (strings or numbers)', 'cluster');
  const cluster = obj.cluster;
  if (cluster.length !== k)
    throw new StatsInputError(`cluster must have one entry per effect (got ${cluster.length} for ${k} effects)`, 'cluster');
  if (k < 2) throw new StatsInputError(`at least 2 effects are needed (got ${k})`, 'effects');
  for (let i = 0; i < k; i++) {
    const y = effects[i];
    if (typeof y !== 'number' || !Number.isFinite(y)) throw new StatsInputError(`effects[${i}] must be a finite number`, 'effects');
    const v = variances[i];
    if (typeof v !== 'number' || !(v > 0 && v < Infinity))
      throw new StatsInputError(`variances[${i}] must be a positive finite number`, 'variances');
    const c = cluster[i];
    if (!(typeof c === 'string' || (typeof c === 'number' && Number.isFinite(c))))
      throw new StatsInputError(`cluster[${i}] must be a string or a finite number`, 'cluster');
  }

  const mods = obj.moderators;
  const withModerators = mods !== undefined;
  if (withModerators && !Array.isArray(mods))
    throw new StatsInputError('moderators must be an array of numeric columns, each with one value per effect', 'moderators');
  const columns = (mods ?? []).map((col, m) => {
    const c = numbers(col, `moderators[${m}]`);
    if (c.length !== k)
      throw new StatsInputError(`moderators[${m}] must have one value per effect (got ${c.length} for ${k} effects)`, 'moderators');
    for (let i = 0; i < k; i++) {
      const x = c[i];
      if (typeof x !== 'number' || !Number.isFinite(x))
        throw new StatsInputError(`moderators[${m}][${i}] must be a finite number`, 'moderators');
    }
    return c as ArrayLike<number>;
  });
  const p = 1 + columns.length;
  if (k <= p)
    throw new StatsInputError(
      `with ${p - 1} moderator${p === 2 ? '' : 's'} at least ${p + 1} effects are needed (got ${k})`,
      'effects',
    );

  // Group by cluster in order of first appearance.
  const ids = new Map<ClusterId, number>();
  const of = new Int32Array(k);
  for (let i = 0; i < k; i++) {
    const c = cluster[i];
    let j = ids.get(c);
    if (j === undefined) {
      j = ids.size;
      ids.set(c, j);
    }
    of[i] = j;
  }
  const J = ids.size;
  if (J < 2) {
    throw new StatsInputError(
      who === 'robustPool'
        ? 'robust variance needs at least 2 clusters, but all effects come from one cluster'
        : 'all effects come from one cluster: the between-cluster variance needs at least 2 clusters',
      'cluster',
    );
  }
  const start = new Int32Array(J + 1);
  for (let i = 0; i < k; i++) start[of[i] + 1]++;
  let maxSize = 0;
  for (let j = 0; j < J; j++) {
    maxSize = Math.max(maxSize, start[j + 1]);
    start[j + 1] += start[j];
  }
  const fill = Int32Array.from(start.subarray(0, J));
  const shift = effects[0] as number;
  const y = new Float64Array(k);
  const v = new Float64Array(k);
  const x = new Float64Array(k * p);
  for (let i = 0; i < k; i++) {
    const pos = fill[of[i]]++;
    y[pos] = (effects[i] as number) - shift;
    v[pos] = variances[i] as number;
    x[pos * p] = 1;
    for (let m = 0; m < columns.length; m++) x[pos * p + 1 + m] = columns[m][i];
  }
  checkFullRank(x, k, p);
  return { k, p, clusters: J, y, v, x, start, shift, withModerators, level, test, maxSize };
}

/** Refuses a design whose columns are collinear (after scaling each to unit length). */
function checkFullRank(x: Float64Array, k: number, p: number): void {
  if (p === 1) return;
  const xtx = new Float64Array(p * p);
  for (let i = 0; i < k; i++)
    for (let a = 0; a < p; a++) for (let b = 0; b <= a; b++) xtx[a * p + b] += x[i * p + a] * x[i * p + b];
  const scaled = new Float64Array(p * p);
  for (let a = 0; a < p; a++)
    for (let b = 0; b <= a; b++) {
      const s = xtx[a * p + b] / Math.sqrt(xtx[a * p + a] * xtx[b * p + b]);
      scaled[a * p + b] = s;
      scaled[b * p + a] = s;
    }
  for (let m = 1; m < p; m++) {
    if (!(xtx[m * p + m] > 0))
      throw new StatsInputError(`moderators[${m - 1}] is 0 for every effect and cannot be estimated`, 'moderators');
    const sub = new Float64Array((m + 1) * (m + 1));
    for (let a = 0; a <= m; a++) for (let b = 0; b <= m; b++) sub[a * (m + 1) + b] = scaled[a * p + b];
    if (!cholesky(sub, m + 1, 1e-10))
      throw new StatsInputError(
        `moderators[${m - 1}] is collinear with the intercept${m > 1 ? ' and the moderators before it' : ''} (constant or a combination of them)`,
        'moderators',
      );
  }
}
