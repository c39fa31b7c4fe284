import { describe, expect, it } from 'vitest';
import { aggregateWithinStudy, begg, cumulative, leaveOneOut, metaRegression, normalTwoTailed, pool, subgroups, tTwoTailed } from '../../../shared/stats/index.js';
import { kendallDistribution } from '../../../shared/stats/begg.js';

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

describe('meta-regression with several moderators and Knapp–Hartung', () => {
  it('effects exactly 1 + 0.5·x + 2·[b] are recovered with a numeric column and a dummy-coded category', () => {
    const x = [0, 1, 2, 3, 4, 5, 6, 7];
    const cat = ['a', 'b', 'a', 'b', 'c', 'a', 'b', 'c'];
    const effects = x.map((xi, i) => 1 + 0.5 * xi + (cat[i] === 'b' ? 2 : 0) + (cat[i] === 'c' ? -1 : 0));
    const r = metaRegression({ effects, variances: x.map((_, i) => 0.5 + i / 10), moderators: [{ name: 'x', values: x }, { name: 'group', values: cat }], method: 'FE' });
    expect(r.coefficients.map((c) => c.name)).toEqual(['intercept', 'x', 'group: b', 'group: c']);
    expect(r.coefficients.map((c) => c.estimate).map((b) => +b.toFixed(10))).toEqual([1, 0.5, 2, -1]);
    expect(r.moderator_type).toBe('mixed');
    expect(r.QM_df).toBe(3);
    expect(r.QE).toBeCloseTo(0, 18);
    expect(r.few_effects_per_covariate).toBe(true);
    // the reference level can be chosen
    const c = metaRegression({ effects, variances: x.map(() => 1), moderators: [{ name: 'group', values: cat, reference: 'b' }], method: 'FE' });
    expect(c.moderators[0].levels).toEqual(['b', 'a', 'c']);
  });

  it('Knapp–Hartung scales the covariance by Σwe²/(k − p), uses t on k − p df and F = Q_M/m', () => {
    const effects = [0, 1, 2.5, 2.9, 4.4];
    const variances = [1, 1, 1, 1, 1];
    const moderator = [0, 1, 2, 3, 4];
    const z = metaRegression({ effects, variances, moderator, method: 'FE' });
    const kh = metaRegression({ effects, variances, moderator, method: 'FE', hksj: true });
    const s2 = z.QE / 3; // FE: residual Q at τ² = 0 on k − p = 3 df
    expect(kh.slope_se!).toBeCloseTo(z.slope_se! * Math.sqrt(s2), 14);
    expect(kh.coefficients[1].statistic_df).toBe(3);
    expect(kh.slope_p!).toBeCloseTo(tTwoTailed(kh.slope! / kh.slope_se!, 3), 14);
    expect(kh.QM_test).toBe('F');
    expect(kh.QM).toBeCloseTo((kh.slope! / kh.slope_se!) ** 2, 12); // F(1, 3) = t²
    expect(kh.QM_p).toBeCloseTo(kh.slope_p!, 12);
    expect(z.QM_test).toBe('chisq');
    expect(() => metaRegression({ effects, variances, moderators: [{ name: 'x', values: moderator }, { name: 'x', values: moderator }] })).toThrow(/given twice/);
    expect(() => metaRegression({ effects, variances, moderators: [{ name: 'x', values: moderator }, { name: 'y', values: moderator.map((m) => 2 * m) }] })).toThrow(/singular design/);
  });
});

describe('subgroups with one pooled τ²', () => {
  const effects = [0.1, 0.5, 0.3, 1.2, 0.2, 0.9, 0.4, 0.8];
  const variances = [0.02, 0.03, 0.01, 0.05, 0.02, 0.04, 0.03, 0.02];
  const groups = ['x', 'y', 'x', 'y', 'z', 'y', 'z', 'x'];

  it('the between test is the mixed-effects model test of the factor (χ², or F under HKSJ), the group rows its cell means', () => {
    for (const hksj of [false, true]) {
      const sg = subgroups({ effects, variances, groups, method: 'REML', hksj, tau2Model: 'pooled' });
      const mr = metaRegression({ effects, variances, moderator: groups, method: 'REML', hksj });
      expect(sg.tau2_model).toBe('pooled');
      expect(sg.tau2_pooled).toBeCloseTo(mr.tau2, 12);
      expect(sg.Q_between).toBeCloseTo(mr.QM, 10);
      expect(sg.Q_between_p).toBeCloseTo(mr.QM_p, 10);
      expect(sg.Q_between_test).toBe(hksj ? 'F' : 'chisq');
      expect(sg.Q_between_df2).toBe(hksj ? 5 : null);
      // cell mean of group x with weights 1/(v + τ²)
      const w = [0, 2, 7].map((i) => 1 / (variances[i] + mr.tau2));
      const mean = (w[0] * 0.1 + w[1] * 0.3 + w[2] * 0.8) / (w[0] + w[1] + w[2]);
      expect(sg.groups[0].estimate).toBeCloseTo(mean, 12);
      expect(sg.groups[0].tau2).toBeCloseTo(mr.tau2, 12);
    }
    expect(() => subgroups({ effects: [1, 2], variances: [1, 1], groups: ['a', 'b'], tau2Model: 'pooled' })).toThrow(/more effects than subgroups/);
  });

  it('with FE the pooled and separate analyses agree on estimates and the between test', () => {
    const a = subgroups({ effects, variances, groups, method: 'FE' });
    const b = subgroups({ effects, variances, groups, method: 'FE', tau2Model: 'pooled' });
    expect(b.groups.map((g) => g.estimate)).toEqual(a.groups.map((g) => expect.closeTo(g.estimate, 12)));
    expect(b.Q_between).toBeCloseTo(a.Q_between!, 10);
  });
});

describe("I² in sensitivity rows and Begg's exact p", () => {
  it('REML leave-one-out rows carry the τ²-based I² of each refit; DL rows leave it null as pool does', () => {
    const effects = [0.1, 0.5, 0.3, 1.2, 0.2, 0.9];
    const variances = [0.02, 0.03, 0.01, 0.05, 0.02, 0.04];
    const rows = leaveOneOut({ effects, variances, method: 'REML' });
    const refit = pool({ effects: effects.slice(1), variances: variances.slice(1), method: 'REML' });
    expect(rows[0].I2_tau).toBeCloseTo(refit.I2_tau!, 10);
    expect(rows[0].I2).toBeCloseTo(refit.I2!, 10);
    expect(cumulative({ effects, variances, method: 'PM' })[5].I2_tau).toBeCloseTo(pool({ effects, variances, method: 'PM' }).I2_tau!, 10);
    expect(leaveOneOut({ effects, variances, method: 'DL' })[0].I2_tau).toBeNull();
  });

  it('k = 4 in perfect order: all 6 pairs concordant, exact p = 2·(1/4!) = 1/12; with ties the normal p', () => {
    const r = begg({ effects: [0.1, 0.2, 0.4, 0.8], variances: [0.01, 0.02, 0.03, 0.04] })!;
    expect(r.p_method).toBe('exact');
    expect(r.p).toBeCloseTo(1 / 12, 15);
    const tied = begg({ effects: [0.1, 0.2, 0.4, 0.8], variances: [0.01, 0.02, 0.02, 0.04] })!;
    expect(tied.p_method).toBe('normal');
    expect(tied.p).toBeCloseTo(normalTwoTailed(tied.z), 15);
  });

  it('the exact distribution sums to 1 and is symmetric; k > 50 uses the normal p', () => {
    const f = kendallDistribution(12);
    expect(f.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 14);
    for (let t = 0; t < f.length; t++) expect(f[t]).toBeCloseTo(f[f.length - 1 - t], 16);
    const k = 60;
    const r = begg({ effects: Array.from({ length: k }, (_, i) => Math.sin(i)), variances: Array.from({ length: k }, (_, i) => 0.01 + i / 1000) })!;
    expect(r.p_method).toBe('normal');
  });
});
