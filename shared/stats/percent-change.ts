import { StatsInputError } from './errors.js';
import { finite, positive, result, type EffectSize } from './effect-checks.js';

/**
 * A percent change p (e.g. "durations were over-reproduced by 12%") as a log ratio of means,
 * ln(1 + p/100); with the SE of p, the variance by the delta method (SE/100)²/(1 + p/100)²
 * (Hedges, Gurevitch & Curtis 1999 for the log ratio). Input: p > −100, se > 0.
 * Example: percentChange(12, 4) → effect ≈ 0.1133287, variance ≈ 0.0012755.
 */
export function percentChange(p: number, se: number): EffectSize {
  finite('percent', p);
  if (!(p > -100)) throw new StatsInputError('percent must be greater than -100', 'percent');
  positive('se', se);
  const ratio = 1 + p / 100;
  return result(Math.log(ratio), (se / 100) ** 2 / (ratio * ratio), 'log_ratio', 'lnrom.percent');
}
