import { StatsInputError } from './errors.js';
import type { PoolInput, PoolResult } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { chiSquareUpperTail } from './chi-square.js';

export interface SubgroupInput extends PoolInput {
  /** the subgroup of each effect */
  groups: ArrayLike<string>;
}

export interface SubgroupResult {
  groups: (PoolResult & { group: string })[];
  /** Q_between = Σ_g (μ̂_g − μ̂)²/SE_g², μ̂ the inverse-SE²-weighted mean of the subgroup estimates */
  Q_between: number | null;
  Q_between_df: number | null;
  Q_between_p: number | null;
}

/**
 * Subgroup analysis: the analysis run separately in each subgroup (a separate τ² per subgroup) and the
 * Q-between test of differences between subgroup estimates, χ² on G − 1 df (Borenstein et al. 2009,
 * ch. 19). Groups are reported in order of first appearance; Q-between is null with fewer than 2 groups.
 * Example: subgroups({ effects: [0, 0, 1, 1], variances: [1, 1, 1, 1], groups: ['a', 'a', 'b', 'b'], method: 'FE' }).Q_between = 1.
 */
export function subgroups(input: SubgroupInput): SubgroupResult {
  const prepared = preparePoolInput(input);
  const { y, v } = prepared;
  const g = input.groups as ArrayLike<unknown>;
  if (!g || typeof g !== 'object' || g.length !== y.length)
    throw new StatsInputError(`groups must have one label per effect (${y.length})`, 'groups');
  const members = new Map<string, number[]>();
  for (let i = 0; i < y.length; i++) {
    const label = g[i];
    if (typeof label !== 'string' || label === '') throw new StatsInputError(`groups[${i}] must be a non-empty string`, 'groups');
    if (!members.has(label)) members.set(label, []);
    members.get(label)!.push(i);
  }
  const groups = [...members.entries()].map(([group, idx]) => {
    const r = poolCore({ y: Float64Array.from(idx, (i) => y[i]), v: Float64Array.from(idx, (i) => v[i]) }, prepared);
    return { group, ...r };
  });
  if (groups.length < 2) return { groups, Q_between: null, Q_between_df: null, Q_between_p: null };
  let sw = 0;
  let swm = 0;
  for (const r of groups) {
    const w = 1 / (r.se * r.se);
    sw += w;
    swm += w * r.estimate;
  }
  const mean = swm / sw;
  let Q = 0;
  for (const r of groups) Q += (r.estimate - mean) ** 2 / (r.se * r.se);
  const df = groups.length - 1;
  return { groups, Q_between: Q, Q_between_df: df, Q_between_p: chiSquareUpperTail(Q, df) };
}
