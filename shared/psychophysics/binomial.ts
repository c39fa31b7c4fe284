import { logGamma } from '../stats/log-gamma.js';

/** Σ ln C(nᵢ, kᵢ): the part of the binomial log-likelihood that does not depend on the parameters. */
export function logChooseSum(n: ArrayLike<number>, k: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < n.length; i++) s += logGamma(n[i] + 1) - logGamma(k[i] + 1) - logGamma(n[i] - k[i] + 1);
  return s;
}

/** Σ kᵢ ln pᵢ + (nᵢ − kᵢ) ln qᵢ with 0·ln 0 = 0 (qᵢ = 1 − pᵢ, given separately for accuracy). */
export function kernelLoglik(n: ArrayLike<number>, k: ArrayLike<number>, p: ArrayLike<number>, q: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < n.length; i++) {
    if (k[i] > 0) s += k[i] * Math.log(p[i]);
    if (n[i] - k[i] > 0) s += (n[i] - k[i]) * Math.log(q[i]);
  }
  return s;
}

/** Deviance against the saturated model (one probability per row): 2 Σ kᵢ ln(kᵢ/nᵢpᵢ) + (nᵢ − kᵢ) ln((nᵢ − kᵢ)/nᵢqᵢ). */
export function binomialDeviance(n: ArrayLike<number>, k: ArrayLike<number>, p: ArrayLike<number>, q: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < n.length; i++) {
    const miss = n[i] - k[i];
    if (k[i] > 0) s += k[i] * Math.log(k[i] / (n[i] * p[i]));
    if (miss > 0) s += miss * Math.log(miss / (n[i] * q[i]));
  }
  return 2 * s;
}
