/** Estimators of the pooled effect: fixed effect and three random-effects tau² estimators. */
export const METHODS = ['FE', 'DL', 'REML', 'PM'] as const;
export type Method = (typeof METHODS)[number];

export type NumericArray = ArrayLike<number> | Float64Array;

export interface PoolInput {
  effects: NumericArray;
  variances: NumericArray;
  /** default "DL" */
  method?: Method;
  /** Hartung–Knapp–Sidik–Jonkman variance and t(k−1) intervals; default false */
  hksj?: boolean;
  /** confidence level of every interval; default 0.95 */
  level?: number;
}

export interface EggerResult {
  intercept: number;
  se: number;
  t: number;
  p: number;
}

export interface PoolResult {
  k: number;
  method: Method;
  hksj: boolean;
  level: number;
  estimate: number;
  se: number;
  ci_lower: number;
  ci_upper: number;
  statistic: number;
  /** null when the statistic is z */
  statistic_df: number | null;
  p: number;
  tau2: number | null;
  tau: number | null;
  tau2_ci_lower: number | null;
  tau2_ci_upper: number | null;
  Q: number | null;
  Q_df: number | null;
  Q_p: number | null;
  I2: number | null;
  /** I² from tau² and the typical within-study variance; REML and PM only */
  I2_tau: number | null;
  H2: number | null;
  pi_lower: number | null;
  pi_upper: number | null;
  egger: EggerResult | null;
  /** percent, summing to 100 */
  weights: number[];
}

/** Validated data: effects y and within-study variances v as Float64Arrays. */
export interface PreparedData {
  y: Float64Array;
  v: Float64Array;
}

export interface PoolOptions {
  method: Method;
  hksj: boolean;
  level: number;
}
