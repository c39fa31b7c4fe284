import { finite, result, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesCorrection } from './hedges-correction.js';

/**
 * Standardized mean change d_z = t/√n from a paired t (Lakens 2013, eq. 7), with variance
 * 1/n + d_z²/(2n) and Hedges' correction on n − 1 df (g_z). d_z is standardized by the SD of the
 * differences, so it is not interchangeable with the raw-score d of smdPaired.
 * Example: dzFromPairedT(3.5355339, 50) → d_z = 0.5, g_z ≈ 0.4923.
 */
export function dzFromPairedT(t: number, n: number): EffectSize {
  finite('t', t);
  sampleSize('n', n);
  const dz = t / Math.sqrt(n);
  const j = hedgesCorrection(n - 1);
  return result(j * dz, j * j * (1 / n + (dz * dz) / (2 * n)), 'hedges_g', 'smd.paired.dz_t');
}
