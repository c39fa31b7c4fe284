import { StatsInputError } from './errors.js';
import type { EffectMetric } from './effect-metrics.js';
import type { HedgesJ } from './hedges-correction.js';

/** What every effect-size function returns: the effect, its sampling variance, the metric and the formula id (see formulas.ts). */
export interface EffectSize {
  effect: number;
  variance: number;
  metric: EffectMetric;
  formula: string;
  /** the small-sample factor applied (standardized mean differences with a J), else absent */
  hedges_j?: HedgesJ;
  /** computed from a bound (e.g. p < .001 taken as p = .001): the effect is at least this far from 0 */
  from_bound?: boolean;
  /** rests on an approximation of the mean and SD (e.g. from a median and quartiles) */
  approximate?: boolean;
}

export function finite(name: string, x: unknown): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new StatsInputError(`${name} must be a finite number`, name);
  return x;
}

export function positive(name: string, x: unknown): number {
  if (typeof x !== 'number' || !(x > 0 && x < Infinity)) throw new StatsInputError(`${name} must be a positive finite number`, name);
  return x;
}

export function nonNegative(name: string, x: unknown): number {
  if (typeof x !== 'number' || !(x >= 0 && x < Infinity)) throw new StatsInputError(`${name} must be a finite number of at least 0`, name);
  return x;
}

export function sampleSize(name: string, x: unknown, min = 2): number {
  if (typeof x !== 'number' || !Number.isInteger(x) || x < min)
    throw new StatsInputError(`${name} must be a whole number of at least ${min}`, name);
  return x;
}

/**
 * A sample size that comes with an SD (or an SE, or quartiles, turned into one): an SD needs at least two
 * observations. `spread` says what came with it in words (default: a standard deviation (sdName)); `min` is the
 * form's own least n, checked after.
 */
export function sizeWithSd(name: string, x: unknown, sdName: string, min = 2, spread = `a standard deviation (${sdName})`): number {
  if (x === 1) throw new StatsInputError(`${name} = 1 cannot come with ${spread}; an SD needs at least 2 observations`, name);
  return sampleSize(name, x, min);
}

export function correlation(name: string, x: unknown): number {
  if (typeof x !== 'number' || !(x > -1 && x < 1)) throw new StatsInputError(`${name} must be a correlation strictly between -1 and 1`, name);
  return x;
}

export function direction(name: string, x: unknown): 1 | -1 {
  if (x !== 1 && x !== -1) throw new StatsInputError(`${name} must be 1 (group 1 higher) or -1 (group 1 lower)`, name);
  return x;
}

export function result(effect: number, variance: number, metric: EffectMetric, formula: string, hedgesJ?: HedgesJ): EffectSize {
  if (!Number.isFinite(effect) || !(variance > 0 && variance < Infinity))
    throw new StatsInputError(`the reported values give no finite effect with a positive variance (${formula})`);
  return hedgesJ ? { effect, variance, metric, formula, hedges_j: hedgesJ } : { effect, variance, metric, formula };
}

/** Marks a fresh result as computed from a bound or as approximate (mutates and returns it). */
export function flagged(es: EffectSize, flag: 'from_bound' | 'approximate'): EffectSize {
  es[flag] = true;
  return es;
}
