import { describe, expect, it } from 'vitest';
import { compareFollowed, DEFAULT_FOLLOW_THRESHOLDS, type FollowedResult } from '../../shared/following/compare.js';

const base: FollowedResult = { k: 3, estimate: 0.3, se: 0.1, ciLower: 0.1, ciUpper: 0.5, tau2: 0.01, weights: { a: 40, b: 30, c: 30 } };

describe('compareFollowed', () => {
  it('no event when nothing crossed a threshold', () => {
    expect(compareFollowed(base, { ...base, estimate: 0.34, ciLower: 0.14, ciUpper: 0.54 }, DEFAULT_FOLLOW_THRESHOLDS)).toEqual([]);
  });
  it('CI now includes 0, and the estimate moved by more than half an SE', () => {
    const ev = compareFollowed(base, { ...base, estimate: 0.2, ciLower: -0.01, ciUpper: 0.41 }, DEFAULT_FOLLOW_THRESHOLDS);
    expect(ev.map((e) => e.kind)).toEqual(['ci_includes_zero', 'estimate_moved']);
  });
  it('a new study over 20% of the weight; thresholds per follower', () => {
    const after = { ...base, k: 4, weights: { a: 30, b: 20, c: 25, d: 25 } };
    expect(compareFollowed(base, after, DEFAULT_FOLLOW_THRESHOLDS)).toEqual([{ kind: 'heavy_new_study', study: 'd', weight: 25 }]);
    expect(compareFollowed(base, after, { seShare: 0.5, weightShare: 0.3 })).toEqual([]);
  });
});
