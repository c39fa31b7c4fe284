import { finite, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesGFromD } from './smd-independent.js';

/**
 * Hedges' g (g_s) from an independent-samples t: d = t·√((n1 + n2)/(n1·n2)) (Borenstein et al. 2009,
 * ch. 7, eq. 7.10), then J and the variance as for means. The sign of t gives the direction (group 1 − group 2).
 * Example: smdFromT(2.985, 50, 50) → d ≈ 0.5970.
 */
export function smdFromT(t: number, n1: number, n2: number): EffectSize {
  finite('t', t);
  sampleSize('n1', n1);
  sampleSize('n2', n2);
  return hedgesGFromD(t * Math.sqrt((n1 + n2) / (n1 * n2)), n1, n2, 'smd.ind.t');
}
