import { direction, nonNegative, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesGFromD } from './smd-independent.js';

/**
 * Hedges' g (g_s) from F(1, df) comparing two independent groups: |t| = √F (Borenstein et al. 2009, ch. 7),
 * sign from the stated direction (1: group 1 higher, −1: lower), then as from t. F = 0 gives d = 0 and needs
 * no direction. Example: smdFromF(8.910225, 50, 50, 1) → d ≈ 0.5970.
 */
export function smdFromF(F: number, n1: number, n2: number, dir?: 1 | -1): EffectSize {
  nonNegative('F', F);
  sampleSize('n1', n1);
  sampleSize('n2', n2);
  const sign = F === 0 ? 1 : direction('direction', dir);
  return hedgesGFromD(sign * Math.sqrt((F * (n1 + n2)) / (n1 * n2)), n1, n2, 'smd.ind.f');
}
