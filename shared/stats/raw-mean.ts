import { finite, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';

/**
 * A single raw mean (e.g. a simultaneity window width in ms) with variance sd²/n (Borenstein et al.
 * 2009, ch. 3). Input: sd > 0, n ≥ 2. Example: rawMean(250, 60, 24) → effect 250, variance 150.
 */
export function rawMean(mean: number, sd: number, n: number, formula = 'mean.raw'): EffectSize {
  finite('mean', mean);
  positive('sd', sd);
  sizeWithSd('n', n, 'sd');
  return result(mean, (sd * sd) / n, 'raw_mean', formula);
}

/** A single raw mean reported with its standard error: variance SE². Example: rawMeanFromSe(250, 12.5).variance = 156.25. */
export function rawMeanFromSe(mean: number, se: number): EffectSize {
  finite('mean', mean);
  positive('se', se);
  return result(mean, se * se, 'raw_mean', 'mean.raw.se');
}
