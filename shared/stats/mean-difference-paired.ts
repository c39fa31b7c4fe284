import { finite, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';

/**
 * Raw mean difference for a within-subject contrast from the mean and SD of the differences:
 * variance sd_diff²/n (Borenstein et al. 2009, ch. 4, eq. 4.8). Example: meanDifferencePaired(5, 10, 50) → variance = 2.
 */
export function meanDifferencePaired(meanDiff: number, sdDiff: number, n: number): EffectSize {
  finite('mean_diff', meanDiff);
  positive('sd_diff', sdDiff);
  sizeWithSd('n', n, 'sd_diff');
  return result(meanDiff, (sdDiff * sdDiff) / n, 'mean_diff', 'md.paired.sd_diff');
}
