import { createHash } from 'node:crypto';
import type { FollowedResult } from '../../shared/following/compare.js';
import type { ComparedResult } from '../../shared/schemas/following.js';
import type { SettledEffect, SynthesisOutput } from '../../shared/synthesis/types.js';

/** A result as a follow keeps it: the numbers compared, the effects it was pooled from and the version read at. */
export type Stored = FollowedResult & { fingerprint: string; effects?: SettledEffect[]; registryVersion?: number };

/** The same digest for the same settled effects, whichever reader (the cache or a snapshot's rows) gave them. */
export function effectsFingerprint(effects: readonly SettledEffect[]): string {
  const keys = effects.map((e) => [e.id, e.studyId, e.effect, e.variance, e.year, e.metric, e.n]).sort((a, b) => Number(a[0]) - Number(b[0]));
  return createHash('sha1').update(JSON.stringify(keys)).digest('hex');
}

/** Only what a synthesis reads (a snapshot's rows carry more). */
export const synthesisEffect = (e: SettledEffect): SettledEffect => ({
  id: e.id,
  referenceId: e.referenceId,
  studyId: e.studyId,
  studyLabel: e.studyLabel,
  referenceLabel: e.referenceLabel,
  year: e.year,
  outcome: e.outcome,
  manipulation: e.manipulation,
  metric: e.metric,
  effect: e.effect,
  variance: e.variance,
  n: e.n,
  design: e.design,
  population: e.population,
  modality: e.modality,
  task: e.task,
  standardMs: e.standardMs,
});

/** The side of a comparison a page shows: the headline numbers and the forest plot. */
export function comparedResult(output: SynthesisOutput | null, registryVersion: number | null): ComparedResult {
  if (!output) return null;
  const r = output.result;
  return { registryVersion, k: r.k, estimate: r.estimate, ciLower: r.ci_lower, ciUpper: r.ci_upper, tau2: r.tau2, forest: output.figures.forest ?? null };
}

