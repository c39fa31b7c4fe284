import { StatsInputError } from './errors.js';
import { finite, positive, result, type EffectSize } from './effect-checks.js';
import { offCentre } from './ci-centring.js';
import { intervalCritical } from './mean-difference-from-ci.js';

/**
 * Log ratio of means from a reported ratio (or percent change, `percent: true`, ratio = 1 + p/100) with its
 * confidence interval. The interval's own scale decides the SE:
 * - centred on the log scale (computed there, the usual case for ratios): SE = (ln U − ln L)/(2c);
 * - centred on the reported scale (ratio or percent ± c·SE): SE_lnR = (U − L)/(2c)/ratio (delta method);
 * both scales in ratio units, c the normal (or t on df) quantile of the level (Hedges, Gurevitch & Curtis 1999
 * for the log ratio). The closer-centred scale wins; an interval centred on neither is refused.
 * Example: logRatioFromCi(1.2, 1.0, 1.44) → ln 1.2, SE = ln 1.44/(2·1.96) ≈ 0.09302.
 */
export function logRatioFromCi(point: number, ciLower: number, ciUpper: number, level = 0.95, df?: number, percent = false): EffectSize {
  const name = percent ? 'percent' : 'ratio';
  finite(name, point);
  finite('ci_lower', ciLower);
  finite('ci_upper', ciUpper);
  const toRatio = (x: number) => (percent ? 1 + x / 100 : x);
  const ratio = toRatio(point), lower = toRatio(ciLower), upper = toRatio(ciUpper);
  positive(percent ? '1 + percent/100' : name, ratio);
  if (!(lower > 0)) throw new StatsInputError(percent ? 'ci_lower must be greater than -100 (percent)' : 'ci_lower must be positive (a ratio)', 'ci_lower');
  if (!(upper > lower)) throw new StatsInputError('ci_upper must be greater than ci_lower', 'ci_upper');
  if (!(ratio >= lower && ratio <= upper)) throw new StatsInputError(`${name} must lie inside the interval`, name);
  const c = intervalCritical(level, df);
  // distances on the reported scale: rounding units of the typed numbers apply there
  const scale = percent ? 100 : 1;
  const offLog = offCentre(point, ciLower, ciUpper, (x) => Math.log(toRatio(x)), 1 / (scale * ratio));
  const offLinear = offCentre(point, ciLower, ciUpper, (x) => x, 1);
  if (offLog > 1 && offLinear > 1) {
    const halves = (f: (x: number) => number) => `${+(f(point) - f(ciLower)).toPrecision(3)} and ${+(f(ciUpper) - f(point)).toPrecision(3)}`;
    const logHalves = halves((x) => Math.log(toRatio(x)));
    throw new StatsInputError(
      `the interval ${ciLower} to ${ciUpper} is not centred on ${name} ${point} on either scale (halves ${logHalves} on the log scale, ` +
        `${halves((x) => x)} in ${percent ? 'percent' : 'ratio units'}); an SE can only be recovered from an interval symmetric on one of them — ` +
        'check the numbers, or enter the group means and SDs instead',
      'ci_lower',
    );
  }
  const base = percent ? 'lnrom.percent_ci' : 'lnrom.ratio_ci';
  if (offLog <= offLinear) {
    const se = (Math.log(upper) - Math.log(lower)) / (2 * c);
    return result(Math.log(ratio), se * se, 'log_ratio', `${base}.log`);
  }
  const se = (upper - lower) / (2 * c) / ratio;
  return result(Math.log(ratio), se * se, 'log_ratio', `${base}.linear`);
}
