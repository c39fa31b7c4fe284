import { StatsInputError } from './errors.js';
import type { Metric } from './metrics.js';

/** What every effect-size function returns: the effect, its sampling variance, the metric and the formula id (see formulas.ts). */
export interface EffectSize {
  effect: number;
  variance: number;
  metric: Metric;
  formula: string;
}

export function finite(name: string, x: unknown): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new StatsInputError(`${name} must be a finite number`, name);
  return x;
}

export function positive(name: string, x: unknown): number {
  if (typeof x !== 'number' || !(x > 0 && x < Infinity)) throw new StatsInputError(`${name} must be a positive finite number`, name);
  return x;
}

export function sampleSize(name: string, x: unknown, min = 2): number {
  if (typeof x !== 'number' || !Number.isInteger(x) || x < min)
    throw new StatsInputError(`${name} must be a whole number of at least ${min}`, name);
  return x;
}

export function correlation(name: string, x: unknown): number {
  if (typeof x !== 'number' || !(x > -1 && x < 1)) throw new StatsInputError(`${name} must be a correlation strictly between -1 and 1`, name);
  return x;
}

export function direction(name: string, x: unknown): 1 | -1 {
  if (x !== 1 && x !== -1) throw new StatsInputError(`${name} must be 1 (group 1 higher) or -1 (group 1 lower)`, name);
  return x;
}

export function result(effect: number, variance: number, metric: Metric, formula: string): EffectSize {
  if (!Number.isFinite(effect) || !(variance > 0 && variance < Infinity))
    throw new StatsInputError(`the reported values give no finite effect with a positive variance (${formula})`);
  return { effect, variance, metric, formula };
}
