import { describe, expect, it } from 'vitest';
import { pool, poolMultilevel, robustPool, StatsInputError } from '../../../shared/stats/index.js';
import { prepareMultilevel } from '../../../shared/stats/multilevel-input.js';
import { fitMultilevelReml, MultilevelReml } from '../../../shared/stats/multilevel-reml.js';
import { gaussian, mulberry32 } from '../../support/random.js';

function seeded(seed: number, sizes: number[], sb = 0.05, sw = 0.03) {
  const rnd = mulberry32(seed);
  const z = gaussian(rnd);
  const effects: number[] = [];
  const variances: number[] = [];
  const cluster: number[] = [];
  const x: number[] = [];
  sizes.forEach((n, j) => {
    const u = Math.sqrt(sb) * z();
    for (let i = 0; i < n; i++) {
      const v = 0.01 + 0.1 * rnd();
      const xi = rnd() - 0.5;
      effects.push(0.3 + 0.4 * xi + u + Math.sqrt(v + sw) * z());
      variances.push(v);
      cluster.push(j);
      x.push(xi);
    }
  });
  return { effects, variances, cluster, moderators: [x] };
}

const base = seeded(1, [3, 1, 4, 2, 5, 1, 3, 2]);
const plain = { effects: base.effects, variances: base.variances, cluster: base.cluster };

describe('poolMultilevel / robustPool: bad input is refused with a clear message', () => {
  const cases: [string, unknown, RegExp][] = [
    ['not an object', null, /input must be an object/],
    ['lengths differ', { ...plain, variances: plain.variances.slice(1) }, /effects and variances must have the same length \(got 21 and 20\)/],
    ['cluster length differs', { ...plain, cluster: plain.cluster.slice(2) }, /cluster must have one entry per effect \(got 19 for 21 effects\)/],
    ['cluster missing', { effects: plain.effects, variances: plain.variances }, /cluster must be an array/],
    ['k < 2', { effects: [0.1], variances: [0.1], cluster: [1] }, /at least 2 effects are needed \(got 1\)/],
    ['non-finite effect', { ...plain, effects: plain.effects.map((e, i) => (i === 4 ? NaN : e)) }, /effects\[4\] must be a finite number/],
    ['infinite effect', { ...plain, effects: plain.effects.map((e, i) => (i === 2 ? Infinity : e)) }, /effects\[2\] must be a finite number/],
    ['zero variance', { ...plain, variances: plain.variances.map((v, i) => (i === 3 ? 0 : v)) }, /variances\[3\] must be a positive finite number/],
    ['negative variance', { ...plain, variances: plain.variances.map((v, i) => (i === 0 ? -0.1 : v)) }, /variances\[0\] must be a positive finite number/],
    ['NaN variance', { ...plain, variances: plain.variances.map((v, i) => (i === 5 ? NaN : v)) }, /variances\[5\] must be a positive finite number/],
    ['string effect', { ...plain, effects: plain.effects.map((e, i) => (i === 1 ? '0.3' : e)) }, /effects\[1\] must be a finite number/],
    ['bad cluster id', { ...plain, cluster: plain.cluster.map((c, i) => (i === 6 ? NaN : c)) }, /cluster\[6\] must be a string or a finite number/],
    ['object cluster id', { ...plain, cluster: plain.cluster.map((c, i) => (i === 0 ? {} : c)) }, /cluster\[0\] must be a string or a finite number/],
    ['moderators not an array', { ...plain, moderators: 3 }, /moderators must be an array of numeric columns/],
    ['moderator length', { ...plain, moderators: [base.moderators[0].slice(1)] }, /moderators\[0\] must have one value per effect \(got 20 for 21 effects\)/],
    ['non-finite moderator', { ...plain, moderators: [base.moderators[0].map((x, i) => (i === 7 ? NaN : x))] }, /moderators\[0\]\[7\] must be a finite number/],
    ['constant moderator', { ...plain, moderators: [plain.effects.map(() => 2)] }, /moderators\[0\] is collinear with the intercept/],
    ['zero moderator', { ...plain, moderators: [plain.effects.map(() => 0)] }, /moderators\[0\] is 0 for every effect/],
    ['collinear moderators', { ...plain, moderators: [base.moderators[0], base.moderators[0].map((x) => 2 * x + 1)] }, /moderators\[1\] is collinear with the intercept and the moderators before it/],
    ['too few effects for the moderators', { effects: [0.1, 0.2], variances: [0.1, 0.1], cluster: [1, 2], moderators: [[0, 1]] }, /with 1 moderator at least 3 effects are needed \(got 2\)/],
    ['level', { ...plain, level: 1.5 }, /level must be a number strictly between 0 and 1/],
  ];
  for (const [name, input, message] of cases) {
    it(name, () => {
      for (const fn of [poolMultilevel, robustPool]) {
        expect(() => fn(input as never)).toThrow(StatsInputError);
        expect(() => fn(input as never)).toThrow(message);
      }
    });
  }

  it('test must be "z" or "t"', () => {
    expect(() => poolMultilevel({ ...plain, test: 'F' as never })).toThrow(/test must be "z" or "t" \(got "F"\)/);
  });

  it('a single cluster: each function says why', () => {
    const one = { ...plain, cluster: plain.cluster.map(() => 'paper-1') };
    expect(() => poolMultilevel(one)).toThrow(/all effects come from one cluster: the between-cluster variance needs at least 2 clusters/);
    expect(() => robustPool(one)).toThrow(/robust variance needs at least 2 clusters, but all effects come from one cluster/);
  });
});

describe('the REML engine', () => {
  const data = prepareMultilevel({ ...base }, 'poolMultilevel');
  const model = new MultilevelReml(data);

  it('analytic gradient and observed Hessian match central differences of the restricted log-likelihood', () => {
    for (const [sb, sw] of [[0.04, 0.02], [0.2, 0.001], [0.003, 0.3]]) {
      const at = model.derivatives(sb, sw)!;
      const ll = (b: number, w: number) => model.point(b, w)!.ll;
      const hb = 1e-5 * sb;
      const hw = 1e-5 * sw;
      const gb = (ll(sb + hb, sw) - ll(sb - hb, sw)) / (2 * hb);
      const gw = (ll(sb, sw + hw) - ll(sb, sw - hw)) / (2 * hw);
      expect(Math.abs(at.grad[0] - gb)).toBeLessThan(1e-5 * at.gradScale[0]);
      expect(Math.abs(at.grad[1] - gw)).toBeLessThan(1e-5 * at.gradScale[1]);
      const dgb = (model.derivatives(sb + hb, sw)!.grad[0] - model.derivatives(sb - hb, sw)!.grad[0]) / (2 * hb);
      const dgw = (model.derivatives(sb, sw + hw)!.grad[1] - model.derivatives(sb, sw - hw)!.grad[1]) / (2 * hw);
      const dgbw = (model.derivatives(sb, sw + hw)!.grad[0] - model.derivatives(sb, sw - hw)!.grad[0]) / (2 * hw);
      const size = Math.max(Math.abs(dgb), Math.abs(dgw));
      expect(Math.abs(at.hessian[0] - dgb)).toBeLessThan(1e-6 * size);
      expect(Math.abs(at.hessian[3] - dgw)).toBeLessThan(1e-6 * size);
      expect(Math.abs(at.hessian[1] - dgbw)).toBeLessThan(1e-6 * size);
      expect(at.hessian[1]).toBe(at.hessian[2]);
      // expected information: symmetric, positive definite
      expect(at.information[0]).toBeGreaterThan(0);
      expect(at.information[0] * at.information[3] - at.information[1] ** 2).toBeGreaterThan(0);
    }
  });

  it('the grid rows (one pass per σ²_within) give the same log-likelihood as a full evaluation', () => {
    const bs = [0, 0.01, 0.1, 1];
    for (const sw of [0, 0.02, 0.5]) {
      const row = model.gridRow(sw, bs);
      bs.forEach((sb, m) => expect(Math.abs(row[m] - model.point(sb, sw)!.ll)).toBeLessThan(1e-9 * Math.abs(row[m])));
    }
  });

  it('the projected gradient vanishes at the optimum (relative ≤ 1e-10), and no grid point is higher', () => {
    for (const d of [data, prepareMultilevel(seeded(5, [2, 2, 3, 1, 2], 0, 0.1), 'poolMultilevel'), prepareMultilevel(seeded(6, [4, 4, 4, 4], 0.1, 0), 'poolMultilevel')]) {
      const fit = fitMultilevelReml(d);
      expect(fit.relativeGradient).toBeLessThanOrEqual(1e-10);
      if (fit.sigma2Between === 0) expect(fit.at.grad[0]).toBeLessThanOrEqual(0);
      if (fit.sigma2Within === 0) expect(fit.at.grad[1]).toBeLessThanOrEqual(0);
      const m = new MultilevelReml(d);
      const top = 4 * Math.max(fit.sigma2Between, fit.sigma2Within, 0.01);
      for (let a = 0; a <= 30; a++)
        for (let b = 0; b <= 30; b++) expect(m.point((a / 30) * top, (b / 30) * top)!.ll).toBeLessThanOrEqual(fit.at.ll + 1e-12);
    }
  });
});

describe('poolMultilevel: properties', () => {
  it('does not depend on the order of the effects or on the cluster labels', () => {
    const r = poolMultilevel(base);
    const order = base.effects.map((_, i) => i).reverse();
    const shuffled = {
      effects: order.map((i) => base.effects[i]),
      variances: order.map((i) => base.variances[i]),
      cluster: order.map((i) => `paper ${base.cluster[i] * 13}`),
      moderators: [order.map((i) => base.moderators[0][i])],
    };
    const s = poolMultilevel(shuffled);
    for (const key of ['estimate', 'se', 'sigma2_between', 'sigma2_within', 'loglik', 'Q', 'pi_lower'] as const)
      expect(s[key]).toBeCloseTo(r[key], 10);
    expect(s.coefficients![1].estimate).toBeCloseTo(r.coefficients![1].estimate, 10);
    expect(robustPool(shuffled).se).toBeCloseTo(robustPool(base).se, 10);
  });

  it('scales: effects ×10 and variances ×100 give σ² ×100 and the same statistics', () => {
    const set = seeded(6, [4, 4, 4, 4, 3, 1], 0.1, 0.05);
    const scaled = { ...set, effects: set.effects.map((e) => 10 * e), variances: set.variances.map((v) => 100 * v) };
    const r = poolMultilevel(set);
    const s = poolMultilevel(scaled);
    expect(Math.min(r.sigma2_between, r.sigma2_within)).toBeGreaterThan(0);
    expect(s.sigma2_between / r.sigma2_between).toBeCloseTo(100, 8);
    expect(s.sigma2_within / r.sigma2_within).toBeCloseTo(100, 8);
    expect(s.statistic).toBeCloseTo(r.statistic, 10);
    expect(s.I2_between).toBeCloseTo(r.I2_between, 9);
    expect(s.coefficients![1].statistic).toBeCloseTo(r.coefficients![1].statistic, 10);
    expect(robustPool(scaled).df).toBeCloseTo(robustPool(set).df, 9);
    expect(robustPool(scaled).t).toBeCloseTo(robustPool(set).t, 9);
  });

  it('all singletons: the two-level REML model, σ² split half and half', () => {
    const one = seeded(9, Array(12).fill(1), 0.05, 0.05);
    const r = poolMultilevel({ effects: one.effects, variances: one.variances, cluster: one.cluster });
    const two = pool({ effects: one.effects, variances: one.variances, method: 'REML' });
    expect(r.sigma2_between).toBe(r.sigma2_within);
    expect(r.sigma2_between + r.sigma2_within).toBeCloseTo(two.tau2!, 9);
    expect(r.estimate).toBeCloseTo(two.estimate, 10);
    expect(r.se).toBeCloseTo(two.se, 10);
    expect(r.Q).toBeCloseTo(two.Q!, 10);
  });

  it('identical effects: σ² = 0, Q = 0 exactly, the estimate is the common value', () => {
    const r = poolMultilevel({ effects: [0.42, 0.42, 0.42, 0.42, 0.42], variances: [0.02, 0.05, 0.03, 0.04, 0.06], cluster: ['a', 'a', 'b', 'b', 'c'] });
    expect([r.sigma2_between, r.sigma2_within, r.Q, r.Q_p, r.I2_between, r.I2_within]).toEqual([0, 0, 0, 1, 0, 0]);
    expect(r.estimate).toBe(0.42);
  });

  it('moderators: [] reports the intercept as the only coefficient; test "t" uses k − p df', () => {
    const r = poolMultilevel({ ...plain, moderators: [] });
    expect(r.coefficients).toHaveLength(1);
    expect(r.coefficients![0].estimate).toBe(r.estimate);
    expect(poolMultilevel(plain).coefficients).toBeUndefined();
    expect(poolMultilevel({ ...base, test: 't' }).statistic_df).toBe(base.effects.length - 2);
    expect(poolMultilevel(plain).statistic_df).toBeNull();
    expect(robustPool(plain).coefficients).toBeUndefined();
    expect(robustPool(base).coefficients).toHaveLength(2);
  });
});
