/**
 * Hedges' small-sample correction J = 1 − 3/(4·df − 1) (Borenstein et al. 2009, eq. 4.22), g = J·d,
 * V_g = J²·V_d. Input: df > 0.25. Example: hedgesCorrection(98) ≈ 0.992327 (n = 50 + 50).
 */
export function hedgesCorrection(df: number): number {
  return 1 - 3 / (4 * df - 1);
}
