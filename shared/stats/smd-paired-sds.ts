import { correlation, finite, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';
import { hedgesJ } from './hedges-correction.js';

/**
 * g_av for a within-subject contrast from the two condition means and SDs with the correlation r:
 * d = (m1 − m2)/S_av, S_av = √((s1² + s2²)/2) (the standardizer of Algina & Keselman 2003 and Bonett 2008);
 * d is approximately a noncentral t on m = 2(n − 1)/(1 + r²) df (Cousineau 2020, The Quantitative Methods for
 * Psychology 16(4)), so g = J(m)·d with the exact J, and V = 2(1 − r)/n + g²(1 + r²)/(4n) (Cousineau
 * 2020, eq. 2; the equal-SD form of Bonett 2008, Psychological Methods 13, 99–109, eq. 10, with n for n − 1).
 * Input: SDs > 0, n ≥ 3, −1 < r < 1.
 * Example: smdPairedSds(105, 10, 100, 10, 50, 0.5) → d = 0.5, m = 78.4, g ≈ 0.49519, variance ≈ 0.021532.
 */
export function smdPairedSds(mean1: number, sd1: number, mean2: number, sd2: number, n: number, r: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n', n, 'sd1', 3);
  correlation('r', r);
  const sAv = Math.sqrt((sd1 * sd1 + sd2 * sd2) / 2);
  const j = hedgesJ((2 * (n - 1)) / (1 + r * r));
  const g = (j.value * (mean1 - mean2)) / sAv;
  return result(g, (2 * (1 - r)) / n + (g * g * (1 + r * r)) / (4 * n), 'g_av', 'smd.paired.sds', j);
}
