import { describe, expect, it } from 'vitest';
import { pool, trimFill } from '../../../shared/stats/index.js';

// Worked by hand with the conventions of issue 3 (equal variances, FE, missing on the left):
// round 1: centre 10/3, |deviations| ranked 0.167, 0.333, 0.667, 1.167, 1.667, 3.333 → Sr = 1+3+4+5 = 13,
//   L0 = (4·13 − 6·7)/11 = 0.909 → k0 = 1;
// round 2: the largest effect (5) trimmed, centre 3; deviations −3, 0, 0.5, 1, 1.5, 2; the study at the centre
//   adds nothing: Sr = 2+3+4+5 = 14, L0 = 14/11 = 1.27 → k0 = 1, stable;
// filled: 2·3 − 5 = 1 (variance 1); adjusted FE over 7 studies = 21/7 = 3.
const effects = [0, 3, 3.5, 4, 4.5, 5];
const variances = [1, 1, 1, 1, 1, 1];

describe('trim-and-fill (Duval & Tweedie 2000, L0)', () => {
  it('the hand-worked example', () => {
    const r = trimFill({ effects, variances, method: 'FE', side: 'left' });
    expect(r.k0).toBe(1);
    expect(r.side).toBe('left');
    expect(r.filled).toHaveLength(1);
    expect(r.filled[0].effect).toBeCloseTo(1, 14);
    expect(r.filled[0].variance).toBe(1);
    expect(r.estimate).toBeCloseTo(3, 14);
    expect(r.tau2).toBeNull();
    expect(Object.keys(r).sort()).toEqual(['ci_lower', 'ci_upper', 'estimate', 'filled', 'k0', 'se', 'side', 'tau2']);
  });

  it('mirrored data mirror the result (side right, filled −1, estimate −3)', () => {
    const r = trimFill({ effects: effects.map((e) => -e), variances, method: 'FE', side: 'right' });
    expect(r.k0).toBe(1);
    expect(r.filled[0].effect).toBeCloseTo(-1, 14);
    expect(r.estimate).toBeCloseTo(-3, 14);
  });

  it('estimates the side from the weighted regression on the SEs: small studies high → missing on the left', () => {
    // larger SEs with larger effects: positive slope → missing studies on the left
    const e = [0.1, 0.15, 0.2, 0.35, 0.5, 0.7, 0.9, 1.2];
    const v = [0.005, 0.01, 0.02, 0.04, 0.06, 0.09, 0.12, 0.16];
    const left = trimFill({ effects: e, variances: v });
    expect(left.side).toBe('left');
    expect(left.k0).toBeGreaterThan(0);
    const right = trimFill({ effects: e.map((x) => -x), variances: v });
    expect(right.side).toBe('right');
    expect(right.k0).toBe(left.k0);
    for (const [i, f] of left.filled.entries()) expect(right.filled[i].effect).toBeCloseTo(-f.effect, 12);
  });

  it('the adjusted result is the analysis refitted with the filled studies', () => {
    const e = [0.1, 0.15, 0.2, 0.35, 0.5, 0.7, 0.9, 1.2];
    const v = [0.005, 0.01, 0.02, 0.04, 0.06, 0.09, 0.12, 0.16];
    for (const method of ['DL', 'REML', 'PM'] as const) {
      const r = trimFill({ effects: e, variances: v, method });
      const refit = pool({ effects: [...e, ...r.filled.map((f) => f.effect)], variances: [...v, ...r.filled.map((f) => f.variance)], method });
      expect(r.estimate).toBeCloseTo(refit.estimate, 12);
      expect(r.se).toBeCloseTo(refit.se, 12);
      expect(r.tau2).toBeCloseTo(refit.tau2!, 12);
      // each filled study mirrors one observed study about the same centre, keeping its variance
      const centres = r.filled.map((f) => {
        const j = v.indexOf(f.variance);
        return (f.effect + e[j]) / 2;
      });
      for (const c of centres) expect(c).toBeCloseTo(centres[0], 12);
    }
  });

  it('k0 = 0 returns the original analysis', () => {
    const e = [-0.2, -0.1, 0, 0.1, 0.2];
    const v = [0.01, 0.02, 0.03, 0.02, 0.01];
    const r = trimFill({ effects: e, variances: v, side: 'left' });
    const p = pool({ effects: e, variances: v });
    expect(r.k0).toBe(0);
    expect(r.filled).toEqual([]);
    expect([r.estimate, r.se, r.ci_lower, r.ci_upper, r.tau2]).toEqual([p.estimate, p.se, p.ci_lower, p.ci_upper, p.tau2]);
  });

  it('refuses fewer than 3 studies and an unknown side', () => {
    expect(() => trimFill({ effects: [1, 2], variances: [1, 1] })).toThrow(/at least 3/);
    expect(() => trimFill({ effects: [1, 2, 3], variances: [1, 1, 1], side: 'up' as never })).toThrow(/side must be/);
  });
});
