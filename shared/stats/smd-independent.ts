import { finite, positive, result, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesCorrection } from './hedges-correction.js';

/** Cohen's d from d and the two group sizes: V_d = (n1 + n2)/(n1·n2) + d²/(2(n1 + n2)) (Borenstein et al. 2009, eq. 4.20), then Hedges' g. */
export function hedgesGFromD(d: number, n1: number, n2: number, formula: string): EffectSize {
  const vd = (n1 + n2) / (n1 * n2) + (d * d) / (2 * (n1 + n2));
  const j = hedgesCorrection(n1 + n2 - 2);
  return result(j * d, j * j * vd, 'hedges_g', formula);
}

/**
 * Hedges' g for two independent groups from means, SDs and sizes: d = (m1 − m2)/S_within,
 * S_within = √(((n1 − 1)s1² + (n2 − 1)s2²)/(n1 + n2 − 2)), g = J·d (Borenstein, Hedges, Higgins &
 * Rothstein 2009, ch. 4, eqs. 4.18–4.23). Input: SDs > 0, n ≥ 2 each.
 * Example: smdIndependent(103, 5.5, 50, 100, 4.5, 50) → g ≈ 0.5924, variance ≈ 0.0411.
 */
export function smdIndependent(mean1: number, sd1: number, n1: number, mean2: number, sd2: number, n2: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sampleSize('n1', n1);
  sampleSize('n2', n2);
  const sWithin = Math.sqrt(((n1 - 1) * sd1 * sd1 + (n2 - 1) * sd2 * sd2) / (n1 + n2 - 2));
  return hedgesGFromD((mean1 - mean2) / sWithin, n1, n2, 'smd.ind.means');
}
