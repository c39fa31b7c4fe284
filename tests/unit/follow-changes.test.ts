import { describe, expect, it } from 'vitest';
import { diffEffects, type EffectBrief } from '../../shared/following/changes.js';

const e = (id: number, studyId: number, effect: number, variance = 0.04): EffectBrief => ({ id, referenceId: studyId * 10, studyId, referenceLabel: `Ref ${studyId}`, studyLabel: 'Experiment 1', effect, variance });

describe('what changed between two sets of settled effects', () => {
  it('nothing, when the same effects hold the same values', () => {
    expect(diffEffects([e(1, 1, 0.3), e(2, 2, 0.1)], [e(2, 2, 0.1), e(1, 1, 0.3)])).toEqual({ added: [], withdrawn: [], corrected: [] });
  });

  it('added and withdrawn by id; an edited value under the same id is corrected', () => {
    const d = diffEffects([e(1, 1, 0.3), e(2, 2, 0.1)], [e(1, 1, 0.35), e(3, 3, 0.5)]);
    expect(d.added.map((x) => x.id)).toEqual([3]);
    expect(d.withdrawn.map((x) => x.id)).toEqual([2]);
    expect(d.corrected).toEqual([{ before: e(1, 1, 0.3), after: e(1, 1, 0.35) }]);
  });

  it('a study settled again (new ids): changed values are corrected, equal values no change, an extra effect added', () => {
    const d = diffEffects([e(1, 1, 0.3), e(2, 1, 0.2), e(5, 4, 0.1)], [e(7, 1, 0.3), e(8, 1, 0.25), e(9, 1, 0.6), e(10, 4, 0.1, 0.05)]);
    expect(d.corrected.map((c) => [c.before.id, c.after.id])).toEqual([[2, 8], [5, 10]]);
    expect(d.added.map((x) => x.id)).toEqual([9]);
    expect(d.withdrawn).toEqual([]);
  });
});
