import { correlation, finite, positive, sampleSize, type EffectSize } from './effect-checks.js';
import { pairedFromD } from './smd-paired.js';

/**
 * Hedges' g for a within-subject contrast from the two condition means and SDs with the correlation r:
 * d = (m1 − m2)/S_within, S_within = √((s1² + s2²)/2), variance (1/n + d²/(2n))·2(1 − r), J on n − 1 df
 * (Borenstein et al. 2009, ch. 4, eq. 4.28; Morris & DeShon 2002, raw-score metric).
 * Example: smdPairedSds(105, 10, 100, 10, 50, 0.5) → d = 0.5, g ≈ 0.4923.
 */
export function smdPairedSds(mean1: number, sd1: number, mean2: number, sd2: number, n: number, r: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sampleSize('n', n);
  correlation('r', r);
  const sWithin = Math.sqrt((sd1 * sd1 + sd2 * sd2) / 2);
  return pairedFromD((mean1 - mean2) / sWithin, n, r, 'smd.paired.sds');
}
