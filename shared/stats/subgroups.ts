import { StatsInputError } from './errors.js';
import type { PoolInput, PoolResult } from './types.js';
import { preparePoolInput } from './validate-input.js';
import { poolCore } from './pool-core.js';
import { chiSquareUpperTail } from './chi-square.js';
import { buildDesign, fitMixedModel } from './meta-regression.js';
import type { ResidualMethod } from './residual-tau2.js';

export interface SubgroupInput extends PoolInput {
  /** the subgroup of each effect */
  groups: ArrayLike<string>;
  /** "separate" (default): a τ² per subgroup; "pooled": one τ² from the mixed-effects model with the factor */
  tau2Model?: 'separate' | 'pooled';
}

export interface SubgroupResult {
  tau2_model: 'separate' | 'pooled';
  /** the common τ² (pooled model; null for FE and for separate τ²) */
  tau2_pooled: number | null;
  groups: (PoolResult & { group: string })[];
  /**
   * The test of differences between subgroups, null with fewer than 2 groups. Separate τ²:
   * Q_between = Σ_g (μ̂_g − μ̂)²/SE_g² (χ² on G − 1). Pooled τ²: the omnibus test of the factor in the
   * mixed-effects model, χ² on G − 1, or under HKSJ the Knapp–Hartung F on (G − 1, k − G) with Q_between the F value.
   */
  Q_between: number | null;
  Q_between_df: number | null;
  Q_between_df2: number | null;
  Q_between_test: 'chisq' | 'F' | null;
  Q_between_p: number | null;
}

const RESIDUAL: Record<string, ResidualMethod> = { FE: 'FE', DL: 'MM', REML: 'REML', PM: 'PM' };

/**
 * Subgroup analysis (Borenstein et al. 2009, ch. 19). Separate τ²: the analysis run separately in each subgroup
 * and the Q-between test of the subgroup estimates. Pooled τ²: the mixed-effects model with the subgroup factor
 * (one residual τ² by the analysis' estimator, DL → method of moments; Raudenbush 2009); each subgroup's estimate
 * is its cell mean in that model (weights 1/(vᵢ + τ²), HKSJ scaling and t on k − G df from the whole model), and
 * the between test is the model's test of the factor. Groups are reported in order of first appearance.
 * Example: subgroups({ effects: [0, 0, 1, 1], variances: [1, 1, 1, 1], groups: ['a', 'a', 'b', 'b'], method: 'FE' }).Q_between = 1.
 */
export function subgroups(input: SubgroupInput): SubgroupResult {
  const prepared = preparePoolInput(input);
  const { y, v } = prepared;
  const k = y.length;
  const model = input.tau2Model ?? 'separate';
  if (model !== 'separate' && model !== 'pooled') throw new StatsInputError('tau2Model must be "separate" or "pooled"', 'tau2Model');
  const g = input.groups as ArrayLike<unknown>;
  if (!g || typeof g !== 'object' || g.length !== k) throw new StatsInputError(`groups must have one label per effect (${k})`, 'groups');
  const members = new Map<string, number[]>();
  for (let i = 0; i < k; i++) {
    const label = g[i];
    if (typeof label !== 'string' || label === '') throw new StatsInputError(`groups[${i}] must be a non-empty string`, 'groups');
    if (!members.has(label)) members.set(label, []);
    members.get(label)!.push(i);
  }
  const entries = [...members.entries()];
  const subset = (idx: number[]) => ({ y: Float64Array.from(idx, (i) => y[i]), v: Float64Array.from(idx, (i) => v[i]) });

  if (model === 'pooled' && entries.length >= 2) {
    const G = entries.length;
    if (k <= G) throw new StatsInputError(`a pooled τ² needs more effects than subgroups (${k} effects, ${G} subgroups)`, 'groups');
    const labels = entries.map(([label]) => label);
    const values = Array.from({ length: k }, (_, i) => g[i] as string);
    const withIntercept = fitMixedModel(y, v, buildDesign([{ name: 'group', values, reference: labels[0] }], k, ['groups']), RESIDUAL[prepared.method], prepared.hksj, prepared.level);
    const between = withIntercept.test(Array.from({ length: G - 1 }, (_, a) => a + 1));
    const tau2 = withIntercept.tau2;
    // cell means: the same model without the intercept, one indicator per subgroup
    const X = new Float64Array(k * G);
    entries.forEach(([, idx], a) => idx.forEach((i) => (X[i * G + a] = 1)));
    const cells = fitMixedModel(y, v, { X, p: G, names: labels, moderators: [] }, RESIDUAL[prepared.method], prepared.hksj, prepared.level);
    const groups = entries.map(([group, idx], a) => {
      const base = poolCore(subset(idx), prepared, { lean: true, tau2 });
      const c = cells.coefficients[a];
      return {
        group,
        ...base,
        estimate: c.estimate, se: c.se, ci_lower: c.ci_lower, ci_upper: c.ci_upper,
        statistic: c.statistic, statistic_df: c.statistic_df, p: c.p,
        tau2: prepared.method === 'FE' ? null : tau2, tau: prepared.method === 'FE' ? null : Math.sqrt(tau2),
      };
    });
    return {
      tau2_model: 'pooled',
      tau2_pooled: prepared.method === 'FE' ? null : tau2,
      groups,
      Q_between: between.statistic,
      Q_between_df: between.df,
      Q_between_df2: between.df2,
      Q_between_test: between.kind,
      Q_between_p: between.p,
    };
  }

  const groups = entries.map(([group, idx]) => ({ group, ...poolCore(subset(idx), prepared) }));
  const empty = { Q_between: null, Q_between_df: null, Q_between_df2: null, Q_between_test: null, Q_between_p: null };
  if (groups.length < 2) return { tau2_model: model, tau2_pooled: null, groups, ...empty };
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
  return {
    tau2_model: 'separate', tau2_pooled: null, groups,
    Q_between: Q, Q_between_df: df, Q_between_df2: null, Q_between_test: 'chisq', Q_between_p: chiSquareUpperTail(Q, df),
  };
}
