import { StatsInputError } from './errors.js';
import { finite, result, sampleSize, type EffectSize } from './effect-checks.js';
import { normalQuantileUpper } from './normal.js';
import { tQuantileUpper } from './student-t.js';
import { offCentre } from './ci-centring.js';

/** The critical value of a two-sided interval: normal, or t on df when the df of the test is given. */
export function intervalCritical(level: number, df?: number): number {
  if (typeof level !== 'number' || !(level > 0 && level < 1)) throw new StatsInputError('level must be strictly between 0 and 1', 'level');
  const alpha = (1 - level) / 2;
  return df === undefined ? normalQuantileUpper(alpha) : tQuantileUpper(alpha, sampleSize('df', df, 1));
}

/**
 * Raw mean difference with its SE from a reported confidence interval: SE = (upper − lower)/(2·c),
 * c the normal quantile of the interval's level, or the t quantile when the df of the test is given
 * (Borenstein et al. 2009, ch. 4). The interval must be centred on the mean difference (within rounding, see
 * ci-centring.ts): an asymmetric one (from a transformed scale, a bootstrap, or a typo) gives no SE this way
 * and is refused. Example: meanDifferenceFromCi(20, 0.4, 39.6, 0.95) → SE ≈ 10.0, variance ≈ 100.0.
 */
export function meanDifferenceFromCi(meanDiff: number, ciLower: number, ciUpper: number, level = 0.95, df?: number): EffectSize {
  finite('mean_diff', meanDiff);
  finite('ci_lower', ciLower);
  finite('ci_upper', ciUpper);
  if (!(ciUpper > ciLower)) throw new StatsInputError('ci_upper must be greater than ci_lower', 'ci_upper');
  if (!(meanDiff >= ciLower && meanDiff <= ciUpper)) throw new StatsInputError('mean_diff must lie inside the interval', 'mean_diff');
  const c = intervalCritical(level, df);
  if (offCentre(meanDiff, ciLower, ciUpper, (x) => x, 1) > 1)
    throw new StatsInputError(
      `the interval ${ciLower} to ${ciUpper} is not centred on mean_diff ${meanDiff} (halves ${+(meanDiff - ciLower).toPrecision(6)} and ${+(ciUpper - meanDiff).toPrecision(6)}); ` +
        'an SE can only be recovered from a symmetric interval — check the numbers, or enter the SE, t or SDs instead',
      'ci_lower',
    );
  const se = (ciUpper - ciLower) / (2 * c);
  return result(meanDiff, se * se, 'mean_diff', df === undefined ? 'md.ci.z' : 'md.ci.t');
}
