/**
 * Intraclass correlations of Shrout & Fleiss (1979), Psychological Bulletin 86, 420–428, from an n×k
 * table (n targets rated by the same k judges), via the two-way ANOVA mean squares:
 * BMS (between targets), WMS (within targets), JMS (between judges), EMS (residual).
 *   ICC(1,1) = (BMS − WMS)/(BMS + (k−1)WMS)          ICC(1,k) = (BMS − WMS)/BMS
 *   ICC(2,1) = (BMS − EMS)/(BMS + (k−1)EMS + k(JMS − EMS)/n)   ICC(2,k) = (BMS − EMS)/(BMS + (JMS − EMS)/n)
 *   ICC(3,1) = (BMS − EMS)/(BMS + (k−1)EMS)          ICC(3,k) = (BMS − EMS)/BMS
 * ICC(2,1) (two-way random, absolute agreement, single rater) is the registry's agreement figure for
 * effect sizes: two coders stand for any two coders, and a systematic offset counts as disagreement.
 * Input: n ≥ 2 rows of k ≥ 2 finite numbers each. A value is null when its denominator is zero.
 * Example (Shrout & Fleiss 1979, Table 2): ICC(2,1) ≈ 0.29, ICC(3,1) ≈ 0.71 for their 6 × 4 ratings.
 */
export interface IccResult {
  n: number;
  k: number;
  bms: number;
  wms: number;
  jms: number;
  ems: number;
  icc1_1: number | null;
  icc2_1: number | null;
  icc3_1: number | null;
  icc1_k: number | null;
  icc2_k: number | null;
  icc3_k: number | null;
}

const ratio = (num: number, den: number) => (den === 0 || !Number.isFinite(den) ? null : num / den);

export function icc(ratings: number[][]): IccResult {
  const n = ratings.length;
  if (n < 2) throw new Error('icc needs at least 2 targets');
  const k = ratings[0].length;
  if (k < 2 || ratings.some((r) => r.length !== k)) throw new Error('icc needs every target rated by the same k ≥ 2 judges');
  if (ratings.some((r) => r.some((x) => !Number.isFinite(x)))) throw new Error('icc needs finite ratings');
  let grand = 0;
  for (const r of ratings) for (const x of r) grand += x;
  grand /= n * k;
  const rowMeans = ratings.map((r) => r.reduce((s, x) => s + x, 0) / k);
  const colMeans = Array.from({ length: k }, (_, j) => ratings.reduce((s, r) => s + r[j], 0) / n);
  let ssRows = 0;
  let ssCols = 0;
  let ssTotal = 0;
  for (let i = 0; i < n; i++) ssRows += k * (rowMeans[i] - grand) ** 2;
  for (let j = 0; j < k; j++) ssCols += n * (colMeans[j] - grand) ** 2;
  for (const r of ratings) for (const x of r) ssTotal += (x - grand) ** 2;
  const ssWithin = ssTotal - ssRows;
  const ssError = ssWithin - ssCols;
  const bms = ssRows / (n - 1);
  const wms = ssWithin / (n * (k - 1));
  const jms = ssCols / (k - 1);
  const ems = ssError / ((n - 1) * (k - 1));
  return {
    n, k, bms, wms, jms, ems,
    icc1_1: ratio(bms - wms, bms + (k - 1) * wms),
    icc2_1: ratio(bms - ems, bms + (k - 1) * ems + (k * (jms - ems)) / n),
    icc3_1: ratio(bms - ems, bms + (k - 1) * ems),
    icc1_k: ratio(bms - wms, bms),
    icc2_k: ratio(bms - ems, bms + (jms - ems) / n),
    icc3_k: ratio(bms - ems, bms),
  };
}
