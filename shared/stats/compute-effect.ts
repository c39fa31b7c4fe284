import { z } from 'zod';
import { StatsInputError } from './errors.js';
import { smdIndependent } from './smd-independent.js';
import { smdFromT } from './smd-from-t.js';
import { smdFromF } from './smd-from-f.js';
import { smdFromP } from './smd-from-p.js';
import { smdPaired } from './smd-paired.js';
import { smdPairedSds } from './smd-paired-sds.js';
import { dzFromPairedT } from './dz-from-paired-t.js';
import { logRatio } from './log-ratio.js';
import { logRatioPaired } from './log-ratio-paired.js';
import { meanDifference } from './mean-difference.js';
import { meanDifferenceFromT } from './mean-difference-from-t.js';
import { meanDifferenceFromCi } from './mean-difference-from-ci.js';
import { meanDifferencePaired } from './mean-difference-paired.js';
import { fisherZ } from './fisher-z.js';
import type { EffectSize } from './effect-checks.js';

export const EFFECT_MEASURES = ['smd', 'smd_paired', 'log_ratio', 'log_ratio_paired', 'mean_diff', 'fisher_z'] as const;
export type EffectMeasure = (typeof EFFECT_MEASURES)[number];

const num = z.number().finite();
const opt = num.optional();

/**
 * The reported values for each measure. Alternatives within a measure are chosen by which fields are
 * present (see computeEffect); each function then checks its own constraints.
 */
export const effectInputSchema = z.discriminatedUnion('measure', [
  z.object({
    measure: z.literal('smd'),
    mean1: opt, sd1: opt, n1: opt, mean2: opt, sd2: opt, n2: opt,
    t: opt, F: opt, p: opt, direction: z.union([z.literal(1), z.literal(-1)]).optional(),
  }),
  z.object({
    measure: z.literal('smd_paired'),
    mean_diff: opt, sd_diff: opt, n: opt, r: opt, mean1: opt, sd1: opt, mean2: opt, sd2: opt, t: opt,
  }),
  z.object({ measure: z.literal('log_ratio'), mean1: num, sd1: num, n1: num, mean2: num, sd2: num, n2: num }),
  z.object({ measure: z.literal('log_ratio_paired'), mean1: num, sd1: num, mean2: num, sd2: num, n: num, r: num }),
  z.object({
    measure: z.literal('mean_diff'),
    mean1: opt, sd1: opt, n1: opt, mean2: opt, sd2: opt, n2: opt,
    mean_diff: opt, t: opt, ci_lower: opt, ci_upper: opt, level: opt, df: opt, sd_diff: opt, n: opt,
  }),
  z.object({ measure: z.literal('fisher_z'), r: num, n: num }),
]);
export type EffectInput = z.infer<typeof effectInputSchema>;

export interface EffectOutput {
  measure: EffectMeasure;
  effect: number;
  variance: number;
  formula: string;
}

const has = (o: Record<string, unknown>, ...keys: string[]) => keys.every((key) => o[key] !== undefined);

function need(measure: string, alternatives: string[]): never {
  throw new StatsInputError(`${measure} needs one of these sets of fields: ${alternatives.join('; ')}`);
}

/**
 * One entry point for the effect-size calculators, keyed by `measure`:
 * - smd: mean1, sd1, n1, mean2, sd2, n2 | t, n1, n2 | F, n1, n2, direction | p, n1, n2, direction
 * - smd_paired: mean_diff, sd_diff, n, r | mean1, sd1, mean2, sd2, n, r | t, n (d_z)
 * - log_ratio: mean1, sd1, n1, mean2, sd2, n2; log_ratio_paired: mean1, sd1, mean2, sd2, n, r
 * - mean_diff: mean1, sd1, n1, mean2, sd2, n2 | mean_diff, sd_diff, n | mean_diff, t | mean_diff, ci_lower, ci_upper [, level, df]
 * - fisher_z: r, n
 * Returns { measure, effect, variance, formula }; throws StatsInputError on missing or invalid values.
 * Example: computeEffect({ measure: 'fisher_z', r: 0.5, n: 103 }) → { effect ≈ 0.5493, variance 0.01, formula 'fisher_z' }.
 */
export function computeEffect(input: unknown): EffectOutput {
  const parsed = effectInputSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = issue.path.join('.');
    throw new StatsInputError(path ? `${path}: ${issue.message}` : issue.message, path || undefined);
  }
  const o = parsed.data as Record<string, any>;
  let es: EffectSize;
  switch (parsed.data.measure) {
    case 'smd':
      if (has(o, 'mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2')) es = smdIndependent(o.mean1, o.sd1, o.n1, o.mean2, o.sd2, o.n2);
      else if (has(o, 't', 'n1', 'n2')) es = smdFromT(o.t, o.n1, o.n2);
      else if (has(o, 'F', 'n1', 'n2', 'direction')) es = smdFromF(o.F, o.n1, o.n2, o.direction);
      else if (has(o, 'p', 'n1', 'n2', 'direction')) es = smdFromP(o.p, o.n1, o.n2, o.direction);
      else need('smd', ['mean1, sd1, n1, mean2, sd2, n2', 't, n1, n2', 'F, n1, n2, direction', 'p, n1, n2, direction']);
      break;
    case 'smd_paired':
      if (has(o, 'mean_diff', 'sd_diff', 'n', 'r')) es = smdPaired(o.mean_diff, o.sd_diff, o.n, o.r);
      else if (has(o, 'mean1', 'sd1', 'mean2', 'sd2', 'n', 'r')) es = smdPairedSds(o.mean1, o.sd1, o.mean2, o.sd2, o.n, o.r);
      else if (has(o, 't', 'n')) es = dzFromPairedT(o.t, o.n);
      else need('smd_paired', ['mean_diff, sd_diff, n, r', 'mean1, sd1, mean2, sd2, n, r', 't, n']);
      break;
    case 'log_ratio':
      es = logRatio(o.mean1, o.sd1, o.n1, o.mean2, o.sd2, o.n2);
      break;
    case 'log_ratio_paired':
      es = logRatioPaired(o.mean1, o.sd1, o.mean2, o.sd2, o.n, o.r);
      break;
    case 'mean_diff':
      if (has(o, 'mean1', 'sd1', 'n1', 'mean2', 'sd2', 'n2')) es = meanDifference(o.mean1, o.sd1, o.n1, o.mean2, o.sd2, o.n2);
      else if (has(o, 'mean_diff', 'sd_diff', 'n')) es = meanDifferencePaired(o.mean_diff, o.sd_diff, o.n);
      else if (has(o, 'mean_diff', 't')) es = meanDifferenceFromT(o.mean_diff, o.t);
      else if (has(o, 'mean_diff', 'ci_lower', 'ci_upper')) es = meanDifferenceFromCi(o.mean_diff, o.ci_lower, o.ci_upper, o.level ?? 0.95, o.df);
      else need('mean_diff', ['mean1, sd1, n1, mean2, sd2, n2', 'mean_diff, sd_diff, n', 'mean_diff, t', 'mean_diff, ci_lower, ci_upper']);
      break;
    case 'fisher_z':
      es = fisherZ(o.r, o.n);
      break;
  }
  return { measure: parsed.data.measure, effect: es.effect, variance: es.variance, formula: es.formula };
}
