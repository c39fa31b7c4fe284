import { describe, expect, it } from 'vitest';
import { aggregateWithinStudy, begg, metaRegression, pool, subgroups } from '../../../shared/stats/index.js';

describe('subgroups and Q-between', () => {
  it('hand example: two groups at 0 and 1 with SE² 0.5 each → Q_between = 1 on 1 df', () => {
    const r = subgroups({ effects: [0, 0, 1, 1], variances: [1, 1, 1, 1], groups: ['a', 'a', 'b', 'b'], method: 'FE' });
    expect(r.groups.map((g) => [g.group, g.k, g.estimate])).toEqual([['a', 2, 0], ['b', 2, 1]]);
    expect(r.Q_between).toBeCloseTo(1, 14);
    expect(r.Q_between_df).toBe(1);
    expect(r.Q_between_p).toBeCloseTo(0.31731050786291415, 12); // P(χ²₁ > 1)
  });

  it('each subgroup has its own tau² (equal to pooling that subgroup alone)', () => {
    const effects = [0.1, 0.5, 0.3, 1.2, 0.2, 0.9];
    const variances = [0.02, 0.03, 0.01, 0.05, 0.02, 0.04];
    const groups = ['x', 'y', 'x', 'y', 'x', 'y'];
    const r = subgroups({ effects, variances, groups, method: 'REML' });
    const y = pool({ effects: [0.5, 1.2, 0.9], variances: [0.03, 0.05, 0.04], method: 'REML' });
    expect(r.groups[1].tau2).toBeCloseTo(y.tau2!, 12);
    expect(() => subgroups({ effects, variances, groups: ['x'], method: 'FE' })).toThrow(/one label per effect/);
  });

  it('a fixed-effect categorical meta-regression gives Q_M equal to Q-between', () => {
    const effects = [0.1, 0.5, 0.3, 1.2, 0.2, 0.9, 0.4];
    const variances = [0.02, 0.03, 0.01, 0.05, 0.02, 0.04, 0.03];
    const groups = ['x', 'y', 'x', 'y', 'z', 'y', 'z'];
    const sg = subgroups({ effects, variances, groups, method: 'FE' });
    const mr = metaRegression({ effects, variances, moderator: groups, method: 'FE' });
    expect(mr.moderator_type).toBe('categorical');
    expect(mr.levels).toEqual(['x', 'y', 'z']);
    expect(mr.QM_df).toBe(2);
    expect(mr.QM).toBeCloseTo(sg.Q_between!, 10);
    expect(mr.slope).toBeNull();
  });
});

describe('meta-regression on one continuous moderator', () => {
  it('effects exactly on a line: slope 1, intercept 0, Q_E = 0, residual tau² 0', () => {
    const r = metaRegression({ effects: [0, 1, 2, 3, 4], variances: [1, 2, 1, 2, 1], moderator: [0, 1, 2, 3, 4], method: 'MM' });
    expect(r.slope).toBeCloseTo(1, 13);
    expect(r.coefficients[0].estimate).toBeCloseTo(0, 13);
    expect(r.QE).toBeCloseTo(0, 20);
    expect(r.tau2).toBe(0);
  });

  it('a moderator that explains heterogeneity lowers tau² (R² in (0, 1]) for MM, REML and PM', () => {
    const x = [1, 2, 3, 4, 5, 6, 7, 8];
    const effects = x.map((xi, i) => 0.2 * xi + [0.05, -0.1, 0.08, -0.02, 0.1, -0.07, 0.03, -0.04][i]);
    const variances = x.map(() => 0.01);
    for (const method of ['MM', 'REML', 'PM'] as const) {
      const r = metaRegression({ effects, variances, moderator: x, method });
      expect(r.tau2).toBeLessThan(r.tau2_total);
      expect(r.R2!).toBeGreaterThan(0.5);
      expect(r.R2!).toBeLessThanOrEqual(1);
      expect(r.slope_p!).toBeLessThan(0.001);
    }
  });

  it('refuses a moderator of the wrong length or with a single level', () => {
    expect(() => metaRegression({ effects: [1, 2, 3], variances: [1, 1, 1], moderator: [1, 2] })).toThrow(/one value per effect/);
    expect(() => metaRegression({ effects: [1, 2, 3], variances: [1, 1, 1], moderator: ['a', 'a', 'a'] })).toThrow(/at least 2 levels/);
  });
});

describe('aggregation within study (Borenstein et al. 2009, ch. 24)', () => {
  it('two effects with r = 0.5: mean 0.5, variance (0.04 + 0.04 + 2·0.5·0.04)/4 = 0.03', () => {
    const r = aggregateWithinStudy({ effects: [0.4, 0.6, 1], variances: [0.04, 0.04, 0.09], studies: ['s', 's', 't'], r: 0.5 });
    expect(r.studies).toEqual(['s', 't']);
    expect(r.counts).toEqual([2, 1]);
    expect(r.effects[0]).toBeCloseTo(0.5, 15);
    expect(r.variances[0]).toBeCloseTo(0.03, 15);
    expect(r.variances[1]).toBe(0.09);
    expect(r.r).toBe(0.5);
  });

  it('r = 0 averages independent effects, r = 1 gives the mean SE squared', () => {
    const v = [0.01, 0.04];
    expect(aggregateWithinStudy({ effects: [0, 1], variances: v, studies: [1, 1], r: 0 }).variances[0]).toBeCloseTo(0.05 / 4, 15);
    expect(aggregateWithinStudy({ effects: [0, 1], variances: v, studies: [1, 1], r: 1 }).variances[0]).toBeCloseTo(((0.1 + 0.2) / 2) ** 2, 15);
    expect(() => aggregateWithinStudy({ effects: [0], variances: [1], studies: [1], r: 2 })).toThrow(/r must be a correlation/);
  });
});

describe("Begg's rank correlation", () => {
  it('standardized effects increasing with the variance give tau = 1; k < 3 gives null', () => {
    const r = begg({ effects: [0.1, 0.2, 0.4, 0.8], variances: [0.01, 0.02, 0.03, 0.04] })!;
    expect(r.tau).toBeCloseTo(1, 14);
    expect(r.S).toBe(6);
    expect(begg({ effects: [1, 2], variances: [1, 2] })).toBeNull();
  });
});
