import type { PoolInput, PoolResult } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';

/**
 * Inverse-variance pooling of k effects yᵢ with within-study variances vᵢ.
 *
 * - FE: μ̂ = Σwᵢyᵢ/Σwᵢ, wᵢ = 1/vᵢ, SE = 1/√Σwᵢ.
 * - Random effects, wᵢ = 1/(vᵢ + τ̂²), with τ̂² by DerSimonian & Laird (1986), REML (Fisher scoring,
 *   global maximum over τ² ≥ 0; Viechtbauer 2005) or Paule & Mandel (1982) (generalized Q = k − 1).
 * - HKSJ (Knapp & Hartung 2003; IntHout et al. 2014): SE² = Σwᵢ(yᵢ − μ̂)² / ((k − 1)Σwᵢ), t on k − 1 df.
 * - Q = Σ(yᵢ − μ̂_FE)²/vᵢ on k − 1 df; I² = 100·max(0, (Q − df)/Q), H² = Q/df (Higgins & Thompson 2002);
 *   I2_tau = 100·τ̂²/(τ̂² + s²) with the typical within-study variance s² (REML and PM only).
 * - Q-profile 100·level% interval for τ² (Viechtbauer 2007).
 * - Prediction interval μ̂ ± t(k−2)·√(τ̂² + SE²), SE as reported (Higgins, Thompson & Spiegelhalter
 *   2009); null for FE and k < 3.
 * - Egger's regression test (Egger et al. 1997), weights in percent.
 *
 * Input: effects and variances as arrays or Float64Arrays of equal length ≥ 1, effects finite,
 * variances positive and finite; method "FE" | "DL" | "REML" | "PM" (default "DL"); hksj (default
 * false); level in (0, 1) (default 0.95). k = 1 returns the study itself with the heterogeneity fields
 * null. Throws StatsInputError naming the offending position.
 *
 * Example: pool({ effects: [0.1, 0.3, 0.5], variances: [0.01, 0.02, 0.04], method: 'FE' }).estimate
 * ≈ 0.2143 (= (10 + 15 + 12.5)/175).
 */
export function pool(input: PoolInput): PoolResult {
  const prepared = preparePoolInput(input);
  return poolCore(prepared, prepared);
}
