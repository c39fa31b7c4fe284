import { correlation, finite, positive, result, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesCorrection } from './hedges-correction.js';

/** d in the raw-score metric for a within-subject contrast, its variance (1/n + d²/(2n))·2(1 − r), and J on n − 1 df (Borenstein et al. 2009, eqs. 4.27–4.28). */
export function pairedFromD(d: number, n: number, r: number, formula: string): EffectSize {
  const vd = (1 / n + (d * d) / (2 * n)) * 2 * (1 - r);
  const j = hedgesCorrection(n - 1);
  return result(j * d, j * j * vd, 'hedges_g', formula);
}

/**
 * Hedges' g for a within-subject (paired) contrast from the mean and SD of the differences:
 * S_within = S_diff/√(2(1 − r)), d = mean_diff/S_within (Borenstein et al. 2009, ch. 4, eq. 4.27;
 * Morris & DeShon 2002). r is the correlation between conditions: when the paper does not report it,
 * it is an explicit, recorded assumption. Input: sd_diff > 0, n ≥ 2, −1 < r < 1.
 * Example: smdPaired(5, 10, 50, 0.5) → d = 0.5 (V 0.0225), g ≈ 0.4923, variance ≈ 0.0218.
 */
export function smdPaired(meanDiff: number, sdDiff: number, n: number, r: number): EffectSize {
  finite('mean_diff', meanDiff);
  positive('sd_diff', sdDiff);
  sampleSize('n', n);
  correlation('r', r);
  const sWithin = sdDiff / Math.sqrt(2 * (1 - r));
  return pairedFromD(meanDiff / sWithin, n, r, 'smd.paired.sd_diff');
}
