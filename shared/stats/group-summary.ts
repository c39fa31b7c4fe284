import { StatsInputError } from './errors.js';
import { finite, positive, sizeWithSd } from './effect-checks.js';
import { normalQuantileUpper } from './normal.js';

/** How a group's mean and SD were obtained: reported, from an SE (SD = SE·√n), or estimated from a median. */
export type SummarySource = 'sd' | 'se' | 'median';

export interface GroupSummary {
  mean: number;
  sd: number;
  n: number;
  source: SummarySource;
}

/** The fields that can describe one group; `suffix` is '1', '2' or '' (a single group). */
export type GroupFields = Partial<Record<string, number>>;

const present = (o: GroupFields, key: string) => o[key] !== undefined;

/**
 * Mean and SD estimated from a median with the quartiles and/or the range (Wan, Wang, Liu & Tong 2014, BMC
 * Medical Research Methodology 14:135), for normal-looking data:
 * - range a…b:        mean ≈ (a + 2m + b)/4, SD ≈ (b − a)/ξ, ξ = 2Φ⁻¹((n − 0.375)/(n + 0.25));
 * - quartiles q1…q3:  mean ≈ (q1 + m + q3)/3, SD ≈ (q3 − q1)/η, η = 2Φ⁻¹((0.75n − 0.125)/(n + 0.25));
 * - both:             mean ≈ (a + 2q1 + 2m + 2q3 + b)/8, SD ≈ (b − a)/(2ξ) + (q3 − q1)/(2η).
 * Example: meanSdFromMedian({ median: 10, lower_quartile: 8, upper_quartile: 13, n: 40 }) → mean ≈ 10.333.
 */
export function meanSdFromMedian(f: { median: number; lower_quartile?: number; upper_quartile?: number; min?: number; max?: number; n: number }, suffix = ''): { mean: number; sd: number } {
  const name = (k: string) => `${k}${suffix}`;
  const m = finite(name('median'), f.median);
  const n = sizeWithSd(name('n'), f.n, name('median'), 2, `quartiles or a range (the SD estimated from them)`);
  const hasIqr = f.lower_quartile !== undefined || f.upper_quartile !== undefined;
  const hasRange = f.min !== undefined || f.max !== undefined;
  if (!hasIqr && !hasRange)
    throw new StatsInputError(`${name('median')} needs ${name('lower_quartile')} and ${name('upper_quartile')}, or ${name('min')} and ${name('max')}`, name('median'));
  const xi = 2 * normalQuantileUpper(1 - (n - 0.375) / (n + 0.25));
  const eta = 2 * normalQuantileUpper(1 - (0.75 * n - 0.125) / (n + 0.25));
  let q1 = NaN, q3 = NaN, a = NaN, b = NaN;
  if (hasIqr) {
    q1 = finite(name('lower_quartile'), f.lower_quartile);
    q3 = finite(name('upper_quartile'), f.upper_quartile);
    if (!(q1 <= m && m <= q3 && q1 < q3))
      throw new StatsInputError(`${name('lower_quartile')} ≤ ${name('median')} ≤ ${name('upper_quartile')} must hold, with the quartiles apart`, name('lower_quartile'));
  }
  if (hasRange) {
    a = finite(name('min'), f.min);
    b = finite(name('max'), f.max);
    if (!(a <= m && m <= b && a < b)) throw new StatsInputError(`${name('min')} ≤ ${name('median')} ≤ ${name('max')} must hold, with min below max`, name('min'));
    if (hasIqr && !(a <= q1 && q3 <= b)) throw new StatsInputError(`the quartiles must lie inside ${name('min')}…${name('max')}`, name('min'));
  }
  if (hasIqr && hasRange) return { mean: (a + 2 * q1 + 2 * m + 2 * q3 + b) / 8, sd: (b - a) / (2 * xi) + (q3 - q1) / (2 * eta) };
  if (hasIqr) return { mean: (q1 + m + q3) / 3, sd: (q3 - q1) / eta };
  return { mean: (a + 2 * m + b) / 4, sd: (b - a) / xi };
}

/**
 * One group's mean, SD and n from what was reported, in this order: mean + SD + n; mean + SE + n (SD = SE·√n);
 * median + quartiles and/or range + n (meanSdFromMedian, approximate). Null when none of these is complete.
 */
export function groupSummary(o: GroupFields, suffix: string): GroupSummary | null {
  const k = (s: string) => `${s}${suffix}`;
  const n = o[k('n')];
  if (present(o, k('mean')) && present(o, k('sd')) && n !== undefined) {
    return { mean: finite(k('mean'), o[k('mean')]), sd: positive(k('sd'), o[k('sd')]), n: sizeWithSd(k('n'), n, k('sd')), source: 'sd' };
  }
  if (present(o, k('mean')) && present(o, k('se')) && n !== undefined) {
    const size = sizeWithSd(k('n'), n, k('se'));
    return { mean: finite(k('mean'), o[k('mean')]), sd: positive(k('se'), o[k('se')]) * Math.sqrt(size), n: size, source: 'se' };
  }
  const spread = [k('lower_quartile'), k('upper_quartile'), k('min'), k('max')].some((f) => present(o, f));
  if (present(o, k('median')) && spread && n !== undefined) {
    const est = meanSdFromMedian(
      { median: o[k('median')]!, lower_quartile: o[k('lower_quartile')], upper_quartile: o[k('upper_quartile')], min: o[k('min')], max: o[k('max')], n },
      suffix,
    );
    return { ...est, n, source: 'median' };
  }
  return null;
}

/** The weakest source of two groups (median < se < sd), which names the formula. */
export function weakerSource(a: SummarySource, b: SummarySource): SummarySource {
  if (a === 'median' || b === 'median') return 'median';
  if (a === 'se' || b === 'se') return 'se';
  return 'sd';
}
