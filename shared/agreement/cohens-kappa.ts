/**
 * Cohen's kappa for two raters on nominal categories, from their k×k contingency table
 * (rows: rater A, columns: rater B):
 *   p_o = Σ p_ii,  p_e = Σ p_i· p_·i,  κ = (p_o − p_e)/(1 − p_e)            (Cohen 1960)
 * with the large-sample variance of Fleiss, Cohen & Everitt (1969), Psychological Bulletin 72, 323–327:
 *   Var(κ) = [Σ p_ii (1 − (p_i· + p_·i)(1 − κ))² + (1 − κ)² Σ_{i≠j} p_ij (p_·i + p_j·)² − (κ − p_e(1 − κ))²] / (n (1 − p_e)²)
 * and under κ = 0:  Var₀(κ) = [p_e + p_e² − Σ p_i· p_·i (p_i· + p_·i)] / (n (1 − p_e)²).
 * Source: Cohen (1960), Educational and Psychological Measurement 20, 37–46.
 * Input: a square table of non-negative counts with a positive total. κ is undefined (null) when p_e = 1
 * (both raters used one and the same category throughout).
 * Example: cohensKappa([[75, 1, 4], [5, 4, 1], [0, 0, 10]]) → kappa ≈ 0.6765 (p_o 0.89, p_e 0.66).
 */
export interface KappaResult {
  n: number;
  percentAgreement: number;
  expectedAgreement: number;
  kappa: number | null;
  se: number | null;
  se0: number | null;
}

export function cohensKappa(table: number[][]): KappaResult {
  const k = table.length;
  if (k === 0 || table.some((row) => row.length !== k)) throw new Error('cohensKappa needs a square table');
  let n = 0;
  for (const row of table) for (const x of row) {
    if (!(x >= 0 && Number.isFinite(x))) throw new Error('cohensKappa needs non-negative finite counts');
    n += x;
  }
  if (!(n > 0)) throw new Error('cohensKappa needs at least one rated item');
  const p = table.map((row) => row.map((x) => x / n));
  const rowM = p.map((row) => row.reduce((s, x) => s + x, 0));
  const colM = p[0].map((_, j) => p.reduce((s, row) => s + row[j], 0));
  let po = 0;
  let pe = 0;
  for (let i = 0; i < k; i++) {
    po += p[i][i];
    pe += rowM[i] * colM[i];
  }
  if (Math.abs(1 - pe) < 1e-15) return { n, percentAgreement: po, expectedAgreement: pe, kappa: null, se: null, se0: null };
  const kappa = (po - pe) / (1 - pe);
  let a = 0;
  let b = 0;
  let c0 = 0;
  for (let i = 0; i < k; i++) {
    a += p[i][i] * (1 - (rowM[i] + colM[i]) * (1 - kappa)) ** 2;
    c0 += rowM[i] * colM[i] * (rowM[i] + colM[i]);
    for (let j = 0; j < k; j++) if (i !== j) b += p[i][j] * (colM[i] + rowM[j]) ** 2;
  }
  const denom = n * (1 - pe) ** 2;
  const v = (a + (1 - kappa) ** 2 * b - (kappa - pe * (1 - kappa)) ** 2) / denom;
  const v0 = (pe + pe * pe - c0) / denom;
  return { n, percentAgreement: po, expectedAgreement: pe, kappa, se: v >= 0 ? Math.sqrt(v) : null, se0: v0 >= 0 ? Math.sqrt(v0) : null };
}

/** Builds the contingency table from paired labels (categories in first-seen order) and returns kappa. */
export function cohensKappaFromPairs(pairs: ReadonlyArray<readonly [string, string]>): KappaResult & { categories: string[] } {
  const categories: string[] = [];
  const idx = (c: string) => {
    let i = categories.indexOf(c);
    if (i < 0) i = categories.push(c) - 1;
    return i;
  };
  for (const [a, b] of pairs) {
    idx(a);
    idx(b);
  }
  const table = categories.map(() => categories.map(() => 0));
  for (const [a, b] of pairs) table[idx(a)][idx(b)] += 1;
  return { ...cohensKappa(table), categories };
}
