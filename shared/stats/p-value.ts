import { StatsInputError } from './errors.js';
import { tQuantileUpper } from './student-t.js';

/**
 * |t| on df from a two-tailed p: t⁻¹(1 − p/2; df), 0 for p = 1. `name` is the reported field (p, or
 * p_less_than for a bound). Input: 0 < p ≤ 1.
 */
export function tFromTwoTailedP(name: string, p: unknown, df: number): number {
  if (typeof p !== 'number' || !(p > 0 && p <= 1)) throw new StatsInputError(`${name} must be greater than 0 and at most 1`, name);
  return p === 1 ? 0 : tQuantileUpper(p / 2, df);
}
