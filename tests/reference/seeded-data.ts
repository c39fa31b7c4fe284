/** Seeded data sets for the reference comparisons (the seeds are fixed, so every run sees the same numbers). */
import { mulberry32, randomEffects } from '../support/random.js';

// The generator itself is tests/support/random.ts; re-exported for callers that still import it from here.
export { gaussian, mulberry32 } from '../support/random.js';

export interface DataSet {
  name: string;
  effects: number[];
  variances: number[];
}

/** Effects yᵢ = μ + √(vᵢ + τ²)·zᵢ with vᵢ uniform in [vmin, vmax]. */
export function randomDataSet(name: string, seed: number, k: number, mu: number, tau2: number, vmin: number, vmax: number): DataSet {
  return { name, ...randomEffects(seed, k, { mu, tau2, vmin, vmax }) };
}

/** The families the issue asks for: k from 2 to 200, identical effects, τ² truncated at 0, huge heterogeneity, tiny variances. */
export function referenceDataSets(): DataSet[] {
  const sets: DataSet[] = [];
  let seed = 1000;
  for (const k of [2, 3, 4, 5, 7, 10, 15, 20, 30, 50, 80, 120, 200]) {
    sets.push(randomDataSet(`heterogeneous k=${k}`, seed++, k, 0.35, 0.08, 0.01, 0.3));
    sets.push(randomDataSet(`mild k=${k}`, seed++, k, -0.2, 0.01, 0.02, 0.2));
  }
  for (const k of [2, 5, 40]) {
    const v = randomDataSet('', seed++, k, 0, 0, 0.01, 0.5).variances;
    sets.push({ name: `identical effects k=${k}`, effects: v.map(() => 0.42), variances: v });
  }
  for (const k of [3, 6, 25, 150]) {
    // effects much closer together than their variances allow: Q < k − 1, so DL's raw τ² is negative
    const rnd = mulberry32(seed++);
    const variances = Array.from({ length: k }, () => 0.05 + 0.2 * rnd());
    const effects = variances.map((v) => 0.3 + 0.2 * Math.sqrt(v) * (2 * rnd() - 1));
    sets.push({ name: `tau2 truncated at 0 k=${k}`, effects, variances });
  }
  for (const k of [3, 12, 60, 200]) sets.push(randomDataSet(`huge heterogeneity k=${k}`, seed++, k, 1.5, 400, 0.001, 0.05));
  for (const k of [4, 20, 100]) sets.push(randomDataSet(`tiny variances k=${k}`, seed++, k, 0.25, 2e-7, 1e-9, 1e-7));
  return sets;
}
