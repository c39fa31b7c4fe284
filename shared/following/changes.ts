/** One settled effect as a change list shows it (an effect id is one settled record version's row). */
export interface EffectBrief {
  id: number;
  referenceId: number;
  studyId: number;
  referenceLabel: string;
  studyLabel: string;
  effect: number;
  variance: number;
}

export interface EffectChanges {
  added: EffectBrief[];
  withdrawn: EffectBrief[];
  /** the same effect with new values, or a study's effect replaced by a later settled version */
  corrected: Array<{ before: EffectBrief; after: EffectBrief }>;
}

export const briefOf = (e: EffectBrief): EffectBrief => ({
  id: e.id,
  referenceId: e.referenceId,
  studyId: e.studyId,
  referenceLabel: e.referenceLabel,
  studyLabel: e.studyLabel,
  effect: e.effect,
  variance: e.variance,
});

const sameValues = (a: EffectBrief, b: EffectBrief) => a.effect === b.effect && a.variance === b.variance;

/**
 * What changed between two sets of settled effects: an id in both with other values is corrected; ids only before
 * and only after within one study (a reopened record settles new rows) pair up in id order as corrected; the rest
 * were withdrawn or added.
 */
export function diffEffects(before: readonly EffectBrief[], after: readonly EffectBrief[]): EffectChanges {
  const afterById = new Map(after.map((e) => [e.id, e]));
  const beforeIds = new Set(before.map((e) => e.id));
  const corrected: EffectChanges['corrected'] = [];
  const gone: EffectBrief[] = [];
  for (const b of [...before].sort((x, y) => x.id - y.id)) {
    const a = afterById.get(b.id);
    if (!a) gone.push(b);
    else if (!sameValues(a, b)) corrected.push({ before: briefOf(b), after: briefOf(a) });
  }
  const fresh = [...after].filter((e) => !beforeIds.has(e.id)).sort((x, y) => x.id - y.id);
  const freshByStudy = new Map<number, EffectBrief[]>();
  for (const e of fresh) freshByStudy.set(e.studyId, [...(freshByStudy.get(e.studyId) ?? []), e]);
  const withdrawn: EffectBrief[] = [];
  for (const b of gone) {
    const a = freshByStudy.get(b.studyId)?.shift();
    if (!a) withdrawn.push(briefOf(b));
    else if (!sameValues(a, b)) corrected.push({ before: briefOf(b), after: briefOf(a) });
  }
  // what no withdrawn effect of its study took up (a re-settled row with the same values is no change)
  const added = [...freshByStudy.values()].flat().sort((x, y) => x.id - y.id).map(briefOf);
  return { added, withdrawn, corrected };
}

/** "2 added, 1 withdrawn, 0 corrected" */
export const changeCounts = (c: { added: unknown[]; withdrawn: unknown[]; corrected: unknown[] }) =>
  `${c.added.length} added, ${c.withdrawn.length} withdrawn, ${c.corrected.length} corrected`;
