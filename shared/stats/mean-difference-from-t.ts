import { StatsInputError } from './errors.js';
import { finite, result, type EffectSize } from './effect-checks.js';

/**
 * Raw mean difference with its SE recovered from the t statistic of the same comparison: SE = D/t,
 * variance (D/t)² (Borenstein et al. 2009, ch. 4). D and t must have the same sign.
 * Example: meanDifferenceFromT(20, 2.5) → variance = 64.
 */
export function meanDifferenceFromT(meanDiff: number, t: number): EffectSize {
  finite('mean_diff', meanDiff);
  finite('t', t);
  if (t === 0 || meanDiff === 0 || Math.sign(t) !== Math.sign(meanDiff))
    throw new StatsInputError('t must be non-zero and have the same sign as mean_diff', 't');
  const se = meanDiff / t;
  return result(meanDiff, se * se, 'mean_diff', 'md.t');
}
