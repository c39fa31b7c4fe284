import type { Method } from './types.js';

/** One refit of a sensitivity analysis (leave-one-out or cumulative). */
export interface SensitivityEntry {
  /** leave-one-out: the position of the omitted study; cumulative: the position of the last study added */
  index: number;
  k: number;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  /** null for z intervals, else the t df (HKSJ); the test statistic is estimate/se and its p-value
   * normalTwoTailed or tTwoTailed of it (left out, with H² = Q/(k − 1), to keep k refits cheap) */
  statistic_df: number | null;
  tau2: number | null;
  /** I² from Q, 100·max(0, (Q − df)/Q) */
  I2: number | null;
  /** I² from τ² and the typical within-study variance (Higgins & Thompson 2002); REML and PM only, as in pool */
  I2_tau: number | null;
  Q: number | null;
}

export function makeEntry(
  index: number,
  k: number,
  method: Method,
  estimate: number,
  se: number,
  crit: number,
  statisticDf: number | null,
  tau2: number,
  Q: number,
): SensitivityEntry {
  const df = k - 1;
  const hetero = k > 1;
  return {
    index,
    k,
    estimate,
    se,
    ci_lower: estimate - crit * se,
    ci_upper: estimate + crit * se,
    statistic_df: statisticDf,
    tau2: method === 'FE' || !hetero ? null : tau2,
    I2: hetero ? (Q > 0 ? 100 * Math.max(0, (Q - df) / Q) : 0) : null,
    I2_tau: null,
    Q: hetero ? Q : null,
  };
}
