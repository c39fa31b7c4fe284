import { StatsInputError } from './errors.js';
import { result, type EffectSize } from './effect-checks.js';

function count(name: string, x: unknown): number {
  if (typeof x !== 'number' || !Number.isInteger(x) || x < 0) throw new StatsInputError(`${name} must be a whole number of at least 0`, name);
  return x;
}

/**
 * Log odds ratio from a 2×2 table (events and non-events in groups 1 and 2): ln((a·d)/(b·c)) with variance
 * 1/a + 1/b + 1/c + 1/d (Woolf 1955; Borenstein et al. 2009, ch. 5). When a cell is 0, 0.5 is added to all
 * four cells of that table first (Haldane 1956 / Anscombe 1956); otherwise the counts are used as they are.
 * Example: logOddsRatio(4, 119, 11, 128) → ln(4·128/(119·11)) ≈ −0.9387, variance ≈ 0.3571.
 */
export function logOddsRatio(events1: number, nonevents1: number, events2: number, nonevents2: number): EffectSize {
  let a = count('events1', events1);
  let b = count('nonevents1', nonevents1);
  let c = count('events2', events2);
  let d = count('nonevents2', nonevents2);
  if (a + b === 0) throw new StatsInputError('group 1 has no participants (events1 + nonevents1 = 0)', 'events1');
  if (c + d === 0) throw new StatsInputError('group 2 has no participants (events2 + nonevents2 = 0)', 'events2');
  const corrected = a === 0 || b === 0 || c === 0 || d === 0;
  if (corrected) {
    a += 0.5;
    b += 0.5;
    c += 0.5;
    d += 0.5;
  }
  return result(Math.log((a * d) / (b * c)), 1 / a + 1 / b + 1 / c + 1 / d, 'log_odds_ratio', corrected ? 'lnor.counts.corrected' : 'lnor.counts');
}
