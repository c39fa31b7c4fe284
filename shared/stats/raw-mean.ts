import { finite, positive, result, sampleSize, type EffectSize } from './effect-checks.js';

/**
 * A single raw mean (e.g. a simultaneity window width in ms) with variance sd²/n (Borenstein et al.
 * 2009, ch. 3). Example: rawMean(250, 60, 24) → effect 250, variance 150.
 */
export function rawMean(mean: number, sd: number, n: number): EffectSize {
  finite('mean', mean);
  positive('sd', sd);
  sampleSize('n', n);
  return result(mean, (sd * sd) / n, 'raw_mean', 'mean.raw');
}
