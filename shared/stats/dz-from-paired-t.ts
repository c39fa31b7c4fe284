import { correlation, finite, positive, result, sampleSize, sizeWithSd, type EffectSize } from './effect-checks.js';
import { hedgesJ } from './hedges-correction.js';

/**
 * g_z from d_z, the mean difference over the SD of the differences: g = J·d_z with the exact J on n − 1 df and
 * V = 1/n + g²/(2n) (Gibbons, Hedeker & Davis 1993, J. Educational Statistics 18, 271–279, eq. 21 with n for n − 1).
 * g_z is not on the raw-score scale of g_s, g_av and g_rm; with r it converts to g_rm (d_rm = d_z·√(2(1 − r))).
 */
export function gzFromDz(dz: number, n: number, formula: string): EffectSize {
  const j = hedgesJ(n - 1);
  const g = j.value * dz;
  return result(g, 1 / n + (g * g) / (2 * n), 'g_z', formula, j);
}

/**
 * Standardized mean change d_z = t/√n from a paired t (Lakens 2013, Frontiers in Psychology 4:863, eq. 7),
 * then g_z as in gzFromDz. Example: dzFromPairedT(3.5355339, 50) → d_z = 0.5, g_z ≈ 0.49230.
 */
export function dzFromPairedT(t: number, n: number, formula = 'smd.paired.dz_t'): EffectSize {
  finite('t', t);
  sampleSize('n', n, 3);
  return gzFromDz(t / Math.sqrt(n), n, formula);
}

/** g_z from the mean and SD of the differences: d_z = mean_diff/S_diff (Lakens 2013, eq. 6). */
export function dzFromDifferences(meanDiff: number, sdDiff: number, n: number, formula = 'smd.paired.dz_sd_diff'): EffectSize {
  finite('mean_diff', meanDiff);
  positive('sd_diff', sdDiff);
  sizeWithSd('n', n, 'sd_diff', 3);
  return gzFromDz(meanDiff / sdDiff, n, formula);
}

/** g_z from the condition means and SDs with r: S_diff = √(s1² + s2² − 2r·s1·s2) (Morris & DeShon 2002, eq. 12), then as dzFromDifferences. */
export function dzFromConditionSds(mean1: number, sd1: number, mean2: number, sd2: number, n: number, r: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n', n, 'sd1', 3);
  correlation('r', r);
  return dzFromDifferences(mean1 - mean2, Math.sqrt(sd1 * sd1 + sd2 * sd2 - 2 * r * sd1 * sd2), n, 'smd.paired.dz_sds');
}
