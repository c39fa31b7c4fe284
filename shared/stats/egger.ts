import { StatsInputError } from './errors.js';
import { prepareData } from './validate-input.js';
import { dlTau2 } from './dl-tau2.js';
import { eggerFromSums } from './egger-core.js';
import type { EggerResult, NumericArray } from './types.js';

/**
 * Egger's regression test for small-study effects (Egger, Davey Smith, Schneider & Minder 1997): OLS of
 * yᵢ/√vᵢ on 1/√vᵢ; returns the intercept, its SE, t and the two-tailed p on k − 2 df. Null for k < 3,
 * all variances equal, all effects equal, or an exact fit. The same figure `pool` reports as `egger`.
 * Example: egger({ effects: [0.1, 0.3, 0.2, 0.5], variances: [0.01, 0.04, 0.02, 0.09] }) → an object with intercept, se, t, p.
 */
export function egger(input: { effects: NumericArray; variances: NumericArray }): EggerResult | null {
  if (input === null || typeof input !== 'object') throw new StatsInputError('input must be an object with effects and variances');
  const { y, v } = prepareData(input.effects, input.variances);
  if (y.length < 3) return null;
  const fe = dlTau2(y, v, true);
  return eggerFromSums(fe.egger!, y.length);
}
