import { StatsInputError } from './errors.js';
import { neumaierSum } from './neumaier-sum.js';

export interface PairedSummary {
  n: number;
  mean1: number;
  sd1: number;
  mean2: number;
  sd2: number;
  /** mean of the differences a − b, equal to mean1 − mean2 */
  mean_diff: number;
  /** SD of the differences (n − 1 in the denominator) */
  sd_diff: number;
  /** Pearson's r between the two conditions, observed in the data (null when either SD is 0) */
  r: number | null;
}

/**
 * Means, SDs (n − 1), the SD of the paired differences and Pearson's r of two paired samples, as a
 * within-subject effect needs them (Borenstein et al. 2009, ch. 4: S_diff² = S1² + S2² − 2r·S1·S2).
 * Input: two arrays of the same length n ≥ 2 of finite numbers, pair i being one participant.
 * Example: pairedSummary([1, 2, 3, 4], [1, 3, 2, 5]) → mean_diff −0.25, sd_diff 0.9574, r 0.8315.
 */
export function pairedSummary(a: ArrayLike<number>, b: ArrayLike<number>): PairedSummary {
  if (a.length !== b.length) throw new StatsInputError(`the two conditions need one value per participant each (got ${a.length} and ${b.length})`, 'b');
  const n = a.length;
  if (n < 2) throw new StatsInputError(`a paired summary needs at least 2 participants with both values (got ${n})`, 'n');
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(a[i])) throw new StatsInputError(`a[${i}] must be a finite number`, 'a');
    if (!Number.isFinite(b[i])) throw new StatsInputError(`b[${i}] must be a finite number`, 'b');
  }
  const m1 = neumaierSum(a) / n;
  const m2 = neumaierSum(b) / n;
  const d1 = Float64Array.from({ length: n }, (_, i) => a[i] - m1);
  const d2 = Float64Array.from({ length: n }, (_, i) => b[i] - m2);
  const ss1 = neumaierSum(d1.map((v) => v * v));
  const ss2 = neumaierSum(d2.map((v) => v * v));
  const sp = neumaierSum(d1.map((v, i) => v * d2[i]));
  const diff = Float64Array.from({ length: n }, (_, i) => a[i] - b[i]);
  const md = neumaierSum(diff) / n;
  const ssd = neumaierSum(diff.map((v) => (v - md) * (v - md)));
  return {
    n,
    mean1: m1,
    sd1: Math.sqrt(ss1 / (n - 1)),
    mean2: m2,
    sd2: Math.sqrt(ss2 / (n - 1)),
    mean_diff: md,
    sd_diff: Math.sqrt(ssd / (n - 1)),
    r: ss1 > 0 && ss2 > 0 ? sp / Math.sqrt(ss1 * ss2) : null,
  };
}
