import { finite, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';
import { hedgesJ } from './hedges-correction.js';

/**
 * g_s from Cohen's d and the two group sizes: g = J·d with the exact J on n1 + n2 − 2 df (Hedges 1981) and
 * the large-sample variance V = 1/n1 + 1/n2 + g²/(2(n1 + n2)) (Hedges & Olkin 1985, ch. 5).
 */
export function hedgesGFromD(d: number, n1: number, n2: number, formula: string): EffectSize {
  const j = hedgesJ(n1 + n2 - 2);
  const g = j.value * d;
  return result(g, 1 / n1 + 1 / n2 + (g * g) / (2 * (n1 + n2)), 'g_s', formula, j);
}

/**
 * Hedges' g (g_s) for two independent groups from means, SDs and sizes: d = (m1 − m2)/S_within,
 * S_within = √(((n1 − 1)s1² + (n2 − 1)s2²)/(n1 + n2 − 2)) (Borenstein, Hedges, Higgins & Rothstein 2009,
 * eqs. 4.18–4.19), then as hedgesGFromD. Input: SDs > 0, n ≥ 2 each.
 * Example: smdIndependent(103, 5.5, 50, 100, 4.5, 50) → g ≈ 0.59241, variance ≈ 0.041755.
 */
export function smdIndependent(
  mean1: number, sd1: number, n1: number, mean2: number, sd2: number, n2: number, formula = 'smd.ind.means',
): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n1', n1, 'sd1');
  sizeWithSd('n2', n2, 'sd2');
  const sWithin = Math.sqrt(((n1 - 1) * sd1 * sd1 + (n2 - 1) * sd2 * sd2) / (n1 + n2 - 2));
  return hedgesGFromD((mean1 - mean2) / sWithin, n1, n2, formula);
}
