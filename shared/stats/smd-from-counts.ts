import { result, type EffectSize } from './effect-checks.js';
import { logOddsRatio } from './log-odds-ratio.js';

const LOGISTIC_SCALE = Math.sqrt(3) / Math.PI;

/**
 * A standardized mean difference (g_s scale) from a 2×2 table through the log odds ratio:
 * d = ln(OR)·√3/π, V_d = V_lnOR·3/π² (Chinn 2000, Statistics in Medicine 19, 3127–3131; the logistic
 * distribution's SD is π/√3). The log odds ratio as in logOddsRatio (0.5 added to every cell only when one is 0).
 * No J is applied. Example: smdFromCounts(4, 119, 11, 128).effect ≈ −0.9387·0.5513 ≈ −0.5175.
 */
export function smdFromCounts(events1: number, nonevents1: number, events2: number, nonevents2: number): EffectSize {
  const lor = logOddsRatio(events1, nonevents1, events2, nonevents2);
  const formula = lor.formula === 'lnor.counts' ? 'smd.ind.counts' : 'smd.ind.counts.corrected';
  return result(LOGISTIC_SCALE * lor.effect, LOGISTIC_SCALE * LOGISTIC_SCALE * lor.variance, 'g_s', formula);
}
