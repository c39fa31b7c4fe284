import { direction, flagged, sampleSize, type EffectSize } from './effect-checks.js';
import { hedgesGFromD } from './smd-independent.js';
import { tFromTwoTailedP } from './p-value.js';

/**
 * Hedges' g (g_s) from a two-tailed p of an independent-samples t test: |t| = t⁻¹(1 − p/2; n1 + n2 − 2),
 * sign from the stated direction, then as from t (Borenstein et al. 2009, ch. 7). p = 1 gives d = 0 and needs
 * no direction. With `bound`, p is a reported bound (p < .001 entered as 0.001): the effect is computed at the
 * bound, so its size is a lower limit, and the result says from_bound. Input: 0 < p ≤ 1.
 * Example: smdFromP(0.05, 20, 20, 1) → |t| = 2.024394164, d ≈ 0.6402.
 */
export function smdFromP(p: number, n1: number, n2: number, dir?: 1 | -1, bound = false): EffectSize {
  sampleSize('n1', n1);
  sampleSize('n2', n2);
  const t = tFromTwoTailedP(bound ? 'p_less_than' : 'p', p, n1 + n2 - 2);
  const sign = t === 0 ? 1 : direction('direction', dir);
  const es = hedgesGFromD(sign * t * Math.sqrt((n1 + n2) / (n1 * n2)), n1, n2, 'smd.ind.p');
  return bound ? flagged(es, 'from_bound') : es;
}
