import { correlation, finite, positive, result, sampleSize, sizeWithSd, type EffectSize } from './effect-checks.js';
import { hedgesJ } from './hedges-correction.js';

/**
 * g_rm from d in the raw-score metric of a within-subject contrast: g = J·d with the exact J on n − 1 df and
 * the large-sample variance V = 2(1 − r)/n + g²/(2n) (Becker 1988, British J. Mathematical and Statistical
 * Psychology 41, 257–278, eq. 13). Not Borenstein et al. (2009) eq. 4.28, which puts d where d_z belongs and
 * understates the variance at high r.
 */
export function rawScoreFromD(d: number, n: number, r: number, formula: string): EffectSize {
  const j = hedgesJ(n - 1);
  const g = j.value * d;
  return result(g, (2 * (1 - r)) / n + (g * g) / (2 * n), 'g_rm', formula, j);
}

/**
 * g_rm for a within-subject (paired) contrast from the mean and SD of the differences and the correlation r
 * between conditions: S_rm = S_diff/√(2(1 − r)), d = mean_diff/S_rm (Morris & DeShon 2002, Psychological
 * Methods 7, 105–125, eq. 11), then as rawScoreFromD. When the paper does not report r it is an explicit,
 * recorded assumption. Input: sd_diff > 0, n ≥ 3, −1 < r < 1.
 * Example: smdPaired(5, 10, 50, 0.5) → d = 0.5, g ≈ 0.49230, variance ≈ 0.022424.
 */
export function smdPaired(meanDiff: number, sdDiff: number, n: number, r: number): EffectSize {
  finite('mean_diff', meanDiff);
  positive('sd_diff', sdDiff);
  sizeWithSd('n', n, 'sd_diff', 3);
  correlation('r', r);
  const sRm = sdDiff / Math.sqrt(2 * (1 - r));
  return rawScoreFromD(meanDiff / sRm, n, r, 'smd.paired.sd_diff');
}

/**
 * g_rm from a paired t and r: d_z = t/√n, d = d_z·√(2(1 − r)) (Morris & DeShon 2002, eq. 11; Lakens 2013,
 * eq. 9), then as rawScoreFromD. The sign of t gives the direction. Example: smdPairedFromT(3.5355339, 50, 0.5).effect ≈ 0.4923.
 */
export function smdPairedFromT(t: number, n: number, r: number, formula = 'smd.paired.t_r'): EffectSize {
  finite('t', t);
  sampleSize('n', n, 3);
  correlation('r', r);
  return rawScoreFromD((t / Math.sqrt(n)) * Math.sqrt(2 * (1 - r)), n, r, formula);
}
