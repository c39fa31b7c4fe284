import { describe, expect, it } from 'vitest';
import { pool, StatsInputError, METHODS } from '../../../shared/stats/index.js';

const CONTRACT_FIELDS = [
  'k', 'method', 'hksj', 'level', 'estimate', 'se', 'ci_lower', 'ci_upper', 'statistic', 'statistic_df', 'p',
  'tau2', 'tau', 'tau2_ci_lower', 'tau2_ci_upper', 'Q', 'Q_df', 'Q_p', 'I2', 'I2_tau', 'H2', 'pi_lower', 'pi_upper',
  'egger', 'weights',
];
const effects = [0.1, 0.3, 0.5, 0.2, 0.9];
const variances = [0.01, 0.02, 0.04, 0.03, 0.05];

describe('pool: the contract', () => {
  it('returns exactly the contract fields, for every method', () => {
    for (const method of METHODS) expect(Object.keys(pool({ effects, variances, method })).sort()).toEqual([...CONTRACT_FIELDS].sort());
  });

  it('defaults to DL, no HKSJ, level 0.95', () => {
    const r = pool({ effects, variances });
    expect([r.method, r.hksj, r.level]).toEqual(['DL', false, 0.95]);
  });

  it('fixed effect by hand: μ = Σy/v ÷ Σ1/v, SE = 1/√Σ1/v; heterogeneity of τ² null', () => {
    const r = pool({ effects: [0.1, 0.3, 0.5], variances: [0.01, 0.02, 0.04], method: 'FE' });
    expect(r.estimate).toBeCloseTo((10 + 15 + 12.5) / 175, 14);
    expect(r.se).toBeCloseTo(1 / Math.sqrt(175), 14);
    expect([r.tau2, r.tau, r.tau2_ci_lower, r.tau2_ci_upper, r.I2_tau, r.pi_lower, r.pi_upper]).toEqual([null, null, null, null, null, null, null]);
    expect(r.statistic_df).toBeNull();
  });

  it('I2_tau only for REML and PM', () => {
    expect(pool({ effects, variances, method: 'DL' }).I2_tau).toBeNull();
    expect(pool({ effects, variances, method: 'REML' }).I2_tau).toBeGreaterThan(0);
    expect(pool({ effects, variances, method: 'PM' }).I2_tau).toBeGreaterThan(0);
  });

  it('HKSJ uses t on k − 1 df and the level is honoured', () => {
    const r = pool({ effects, variances, hksj: true, level: 0.9 });
    expect(r.statistic_df).toBe(4);
    const z = pool({ effects, variances, level: 0.9 });
    const z95 = pool({ effects, variances });
    expect(z.ci_upper - z.ci_lower).toBeLessThan(z95.ci_upper - z95.ci_lower);
    expect((z.ci_upper - z.ci_lower) / (2 * z.se)).toBeCloseTo(1.6448536269514722, 12); // normal 0.95 quantile
  });

  it('weights are percent and sum to 100; arrays and Float64Arrays give identical results', () => {
    const a = pool({ effects, variances, method: 'REML' });
    const b = pool({ effects: Float64Array.from(effects), variances: Float64Array.from(variances), method: 'REML' });
    expect(a.weights.reduce((s, w) => s + w, 0)).toBeCloseTo(100, 12);
    expect(Array.isArray(a.weights)).toBe(true);
    expect(b).toEqual(a);
  });

  it('tau² is never negative: homogeneous effects give tau² = 0 and I² = 0 for every estimator', () => {
    const e = [0.3, 0.31, 0.29, 0.3, 0.305];
    for (const method of ['DL', 'REML', 'PM'] as const) {
      const r = pool({ effects: e, variances, method });
      expect(r.tau2).toBe(0);
      expect(r.I2).toBe(0);
      expect(r.tau2_ci_lower).toBe(0);
    }
  });
});

describe('pool: degenerate inputs', () => {
  it('k = 1 returns the study itself with heterogeneity fields null', () => {
    const r = pool({ effects: [0.4], variances: [0.04], method: 'REML', hksj: true });
    expect(r.k).toBe(1);
    expect(r.estimate).toBe(0.4);
    expect(r.se).toBeCloseTo(0.2, 15);
    expect(r.ci_lower).toBeCloseTo(0.4 - 1.959963984540054 * 0.2, 14);
    for (const f of ['tau2', 'tau', 'tau2_ci_lower', 'tau2_ci_upper', 'Q', 'Q_df', 'Q_p', 'I2', 'I2_tau', 'H2', 'pi_lower', 'pi_upper', 'egger'] as const)
      expect(r[f]).toBeNull();
    expect(r.weights).toEqual([100]);
  });

  it('k = 2: Q on 1 df, no prediction interval, no Egger test', () => {
    const r = pool({ effects: [0, 1], variances: [0.1, 0.1] });
    expect(r.Q_df).toBe(1);
    expect(r.Q).toBeCloseTo(5, 12); // (0.5² + 0.5²)/0.1
    expect(r.pi_lower).toBeNull();
    expect(r.egger).toBeNull();
    expect(r.tau2).toBeCloseTo((5 - 1) / (20 - 200 / 20), 12); // DL by hand
  });

  it('identical effects: Q = 0 exactly, I² = 0, HKSJ SE 0', () => {
    const r = pool({ effects: [0.2, 0.2, 0.2], variances: [0.01, 0.02, 0.05], hksj: true });
    expect(r.Q).toBe(0);
    expect(r.I2).toBe(0);
    expect(r.se).toBe(0);
    expect(r.estimate).toBe(0.2);
  });

  it('tiny variances keep full relative precision (FE by hand)', () => {
    const r = pool({ effects: [1, 2], variances: [1e-12, 3e-12], method: 'FE' });
    expect(r.estimate).toBeCloseTo((1e12 + 2 * (1e12 / 3)) / (1e12 + 1e12 / 3), 13);
    expect(r.se / Math.sqrt(1 / (1e12 + 1e12 / 3))).toBeCloseTo(1, 13);
  });

  it('prediction interval is wider than the CI and uses the HKSJ SE when HKSJ is on', () => {
    const r = pool({ effects, variances, hksj: true });
    expect(r.pi_lower!).toBeLessThan(r.ci_lower);
    expect(r.pi_upper!).toBeGreaterThan(r.ci_upper);
    const half = (r.pi_upper! - r.pi_lower!) / 2;
    expect(half / Math.sqrt(r.tau2! + r.se * r.se)).toBeCloseTo(3.182446305284263, 9); // t(0.975; 3)
  });
});

describe('pool: refusals name the offending position', () => {
  const cases: [string, unknown, RegExp][] = [
    ['empty', { effects: [], variances: [] }, /effects must not be empty/],
    ['mismatched', { effects: [1, 2], variances: [1] }, /same length \(got 2 and 1\)/],
    ['zero variance', { effects: [1, 2, 3, 4], variances: [1, 1, 1, 0] }, /variances\[3\] must be a positive finite number/],
    ['negative variance', { effects: [1, 2], variances: [-1, 1] }, /variances\[0\] must be a positive finite number/],
    ['infinite variance', { effects: [1, 2], variances: [1, Infinity] }, /variances\[1\]/],
    ['NaN effect', { effects: [1, NaN], variances: [1, 1] }, /effects\[1\] must be a finite number/],
    ['string effect', { effects: [1, '2'], variances: [1, 1] }, /effects\[1\] must be a finite number/],
    ['bad method', { effects: [1], variances: [1], method: 'XX' }, /method must be one of FE, DL, REML, PM/],
    ['bad level', { effects: [1], variances: [1], level: 95 }, /level must be a number strictly between 0 and 1/],
    ['bad hksj', { effects: [1], variances: [1], hksj: 'yes' }, /hksj must be true or false/],
    ['not an array', { effects: 3, variances: [1] }, /effects must be an array of numbers/],
  ];
  for (const [name, input, message] of cases) {
    it(name, () => {
      expect(() => pool(input as never)).toThrow(StatsInputError);
      expect(() => pool(input as never)).toThrow(message);
    });
  }
});
