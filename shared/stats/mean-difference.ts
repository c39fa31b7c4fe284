import { finite, positive, result, sizeWithSd, type EffectSize } from './effect-checks.js';

/**
 * Raw mean difference D = m1 − m2 for independent groups in the outcome's units (ms), with variance
 * s1²/n1 + s2²/n2 (Borenstein et al. 2009, ch. 4, eq. 4.4, the form that does not assume equal SDs).
 * Input: SDs > 0, n ≥ 2 each. Example: meanDifference(103, 5.5, 50, 100, 4.5, 50) → D = 3, variance = 1.01.
 */
export function meanDifference(
  mean1: number, sd1: number, n1: number, mean2: number, sd2: number, n2: number, formula = 'md.ind.sds',
): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('sd1', sd1);
  positive('sd2', sd2);
  sizeWithSd('n1', n1, 'sd1');
  sizeWithSd('n2', n2, 'sd2');
  return result(mean1 - mean2, (sd1 * sd1) / n1 + (sd2 * sd2) / n2, 'mean_diff', formula);
}

/**
 * Raw mean difference for independent groups from each group's mean and standard error:
 * variance SE1² + SE2² (the same variance as from SDs, SE = SD/√n). Example: meanDifferenceFromSes(103, 0.7778, 100, 0.6364) → D = 3.
 */
export function meanDifferenceFromSes(mean1: number, se1: number, mean2: number, se2: number): EffectSize {
  finite('mean1', mean1);
  finite('mean2', mean2);
  positive('se1', se1);
  positive('se2', se2);
  return result(mean1 - mean2, se1 * se1 + se2 * se2, 'mean_diff', 'md.ind.ses');
}

/** A raw mean difference reported with its standard error: variance SE². Example: meanDifferenceFromSe(20, 10).variance = 100. */
export function meanDifferenceFromSe(meanDiff: number, se: number): EffectSize {
  finite('mean_diff', meanDiff);
  positive('se', se);
  return result(meanDiff, se * se, 'mean_diff', 'md.se');
}
