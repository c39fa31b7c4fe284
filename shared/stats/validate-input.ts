import { StatsInputError } from './errors.js';
import { METHODS, type Method, type NumericArray, type PoolInput, type PoolOptions, type PreparedData } from './types.js';

/**
 * Checks effects/variances and copies them into Float64Arrays (kept as is when already Float64Array).
 * Refuses empty input, mismatched lengths, non-finite effects and zero, negative or non-finite variances,
 * naming the first offending position.
 */
export function prepareData(effects: unknown, variances: unknown, minK = 1): PreparedData {
  const y = toFloat64(effects, 'effects');
  const v = toFloat64(variances, 'variances');
  if (y.length === 0) throw new StatsInputError('effects must not be empty', 'effects');
  if (y.length !== v.length)
    throw new StatsInputError(
      `effects and variances must have the same length (got ${y.length} and ${v.length})`,
      'variances',
    );
  if (y.length < minK) throw new StatsInputError(`at least ${minK} effects are needed (got ${y.length})`, 'effects');
  for (let i = 0; i < y.length; i++) {
    if (!Number.isFinite(y[i])) throw new StatsInputError(`effects[${i}] must be a finite number`, 'effects');
    const vi = v[i];
    if (!(vi > 0 && vi < Infinity)) throw new StatsInputError(`variances[${i}] must be a positive finite number`, 'variances');
  }
  return { y, v };
}

function toFloat64(values: unknown, name: string): Float64Array {
  if (values instanceof Float64Array) return values;
  if (!Array.isArray(values) && !ArrayBuffer.isView(values))
    throw new StatsInputError(`${name} must be an array of numbers`, name);
  const src = values as ArrayLike<unknown>;
  const out = new Float64Array(src.length);
  for (let i = 0; i < src.length; i++) {
    const x = src[i];
    if (typeof x !== 'number') throw new StatsInputError(`${name}[${i}] must be a finite number`, name);
    out[i] = x;
  }
  return out;
}

/** Defaults and checks for method, hksj and level. */
export function prepareOptions(input: Partial<PoolInput>): PoolOptions {
  const method = (input.method ?? 'DL') as Method;
  if (!METHODS.includes(method))
    throw new StatsInputError(`method must be one of ${METHODS.join(', ')} (got ${JSON.stringify(input.method)})`, 'method');
  const hksj = input.hksj ?? false;
  if (typeof hksj !== 'boolean') throw new StatsInputError('hksj must be true or false', 'hksj');
  const level = input.level ?? 0.95;
  if (typeof level !== 'number' || !(level > 0 && level < 1))
    throw new StatsInputError('level must be a number strictly between 0 and 1', 'level');
  return { method, hksj, level };
}

export function preparePoolInput(input: unknown, minK = 1): PreparedData & PoolOptions {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object with effects and variances');
  const obj = input as Partial<PoolInput> & { effects?: NumericArray; variances?: NumericArray };
  const options = prepareOptions(obj);
  const data = prepareData(obj.effects, obj.variances, minK);
  return { ...data, ...options };
}
