import { describe, expect, it } from 'vitest';
import {
  computeEffect, formulas, METRICS, StatsInputError, smdFromT, smdFromF, smdFromP, smdPairedSds, dzFromPairedT,
  logRatio, logRatioPaired, percentChange, meanDifference, meanDifferenceFromT, meanDifferenceFromCi,
  meanDifferencePaired, rawMean, fisherZ, smdIndependent,
} from '../../../shared/stats/index.js';

// Hand computations from the formulas in each file's doc comment.
describe('effect sizes', () => {
  it('METRICS are the registry metric names', () => {
    expect(METRICS).toEqual(['hedges_g', 'log_ratio', 'mean_diff', 'raw_mean', 'fisher_z']);
  });

  it('g from t, F and p agrees with g from the means that produced them', () => {
    const base = smdIndependent(103, 5.5, 50, 100, 4.5, 50);
    const sw = Math.sqrt((49 * 5.5 ** 2 + 49 * 4.5 ** 2) / 98);
    const t = 3 / (sw * Math.sqrt(2 / 50));
    expect(smdFromT(t, 50, 50).effect).toBeCloseTo(base.effect, 13);
    expect(smdFromF(t * t, 50, 50, 1).effect).toBeCloseTo(base.effect, 13);
    expect(smdFromF(t * t, 50, 50, -1).effect).toBeCloseTo(-base.effect, 13);
    expect(smdFromT(t, 50, 50).variance).toBeCloseTo(base.variance, 13);
  });

  it('g from a two-tailed p: p = 0.05, n 20 + 20 → |t| = 2.024394164 (t(0.975; 38)), d = t·√(1/10)', () => {
    const r = smdFromP(0.05, 20, 20, -1);
    const J = 1 - 3 / (4 * 38 - 1);
    expect(r.effect).toBeCloseTo(-J * 2.0243941639119702 * Math.sqrt(0.1), 9);
    expect(r.formula).toBe('smd.ind.p');
  });

  it('within subject from both SDs with r, and d_z from a paired t', () => {
    const a = smdPairedSds(105, 10, 100, 10, 50, 0.5);
    expect(a.effect).toBeCloseTo(0.5 * (1 - 3 / 195), 14);
    expect(a.variance).toBeCloseTo((1 / 50 + 0.25 / 100) * (1 - 3 / 195) ** 2, 14);
    const dz = dzFromPairedT(0.5 * Math.sqrt(50), 50);
    expect(dz.effect).toBeCloseTo(0.5 * (1 - 3 / 195), 14);
    expect(dz.formula).toBe('smd.paired.dz_t');
  });

  it('log ratio of means, independent and paired (Lajeunesse 2011)', () => {
    const a = logRatio(1100, 200, 20, 1000, 180, 20);
    expect(a.effect).toBeCloseTo(Math.log(1.1), 15);
    expect(a.variance).toBeCloseTo(200 ** 2 / (20 * 1100 ** 2) + 180 ** 2 / (20 * 1000 ** 2), 15);
    const b = logRatioPaired(1100, 200, 1000, 180, 20, 0.5);
    expect(b.variance).toBeCloseTo(a.variance - (2 * 0.5 * (200 / 1100) * (180 / 1000)) / 20, 15);
    expect(b.metric).toBe('log_ratio');
    expect(percentChange(12, 4).effect).toBeCloseTo(Math.log(1.12), 15);
    expect(percentChange(12, 4).variance).toBeCloseTo(0.04 ** 2 / 1.12 ** 2, 15);
  });

  it('raw mean differences from SDs, t, a CI and paired differences; raw means; Fisher z', () => {
    expect(meanDifference(103, 5.5, 50, 100, 4.5, 50)).toMatchObject({ effect: 3, metric: 'mean_diff', formula: 'md.ind.sds' });
    expect(meanDifference(103, 5.5, 50, 100, 4.5, 50).variance).toBeCloseTo(1.01, 14);
    expect(meanDifferenceFromT(20, 2.5).variance).toBeCloseTo(64, 12);
    expect(meanDifferenceFromCi(20, 0.4, 39.6).variance).toBeCloseTo((39.2 / (2 * 1.959963984540054)) ** 2, 10);
    expect(meanDifferenceFromCi(20, 0.4, 39.6, 0.95, 10).formula).toBe('md.ci.t');
    expect(meanDifferencePaired(5, 10, 50).variance).toBeCloseTo(2, 14);
    expect(rawMean(250, 60, 24)).toMatchObject({ effect: 250, variance: 150, metric: 'raw_mean' });
    expect(fisherZ(0.5, 103).effect).toBeCloseTo(0.5493061443340548, 15);
    expect(fisherZ(0.5, 103).variance).toBeCloseTo(0.01, 15);
  });

  it('every formula id used has a label, expression and source', () => {
    const ids = [
      smdIndependent(1, 1, 5, 0, 1, 5), smdFromT(1, 5, 5), smdFromF(1, 5, 5, 1), smdFromP(0.2, 5, 5, 1), smdPairedSds(1, 1, 0, 1, 5, 0.5),
      dzFromPairedT(1, 5), logRatio(2, 1, 5, 1, 1, 5), logRatioPaired(2, 1, 1, 1, 5, 0.5), percentChange(5, 1), meanDifference(1, 1, 5, 0, 1, 5),
      meanDifferenceFromT(1, 1), meanDifferenceFromCi(1, 0, 2), meanDifferenceFromCi(1, 0, 2, 0.95, 5), meanDifferencePaired(1, 1, 5), rawMean(1, 1, 5), fisherZ(0.1, 10),
    ].map((r) => r.formula);
    for (const id of ids) {
      expect(formulas[id], id).toBeDefined();
      expect(formulas[id].expression.length).toBeGreaterThan(5);
      expect(formulas[id].source).toMatch(/\d{4}/);
    }
  });

  it('invalid values are refused by name', () => {
    expect(() => smdIndependent(1, -1, 5, 0, 1, 5)).toThrow(/sd1 must be a positive finite number/);
    expect(() => smdIndependent(1, 1, 5.5, 0, 1, 5)).toThrow(/n1 must be a whole number/);
    expect(() => fisherZ(1, 10)).toThrow(/r must be a correlation/);
    expect(() => logRatio(-1, 1, 5, 1, 1, 5)).toThrow(/mean1 must be a positive/);
    expect(() => meanDifferenceFromT(5, -1)).toThrow(/same sign/);
    expect(() => smdFromF(4, 10, 10, 0 as never)).toThrow(/direction/);
    expect(() => percentChange(-100, 1)).toThrow(StatsInputError);
  });
});

describe('computeEffect (the CLI and route shape)', () => {
  it('returns { measure, effect, variance, formula } for each measure', () => {
    const cases = [
      { measure: 'smd', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 },
      { measure: 'smd', t: 2.5, n1: 20, n2: 22 },
      { measure: 'smd_paired', mean1: 105, sd1: 10, mean2: 100, sd2: 10, n: 50, r: 0.5 },
      { measure: 'log_ratio', mean1: 1100, sd1: 200, n1: 20, mean2: 1000, sd2: 180, n2: 20 },
      { measure: 'log_ratio_paired', mean1: 1100, sd1: 200, mean2: 1000, sd2: 180, n: 20, r: 0.5 },
      { measure: 'mean_diff', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 },
      { measure: 'mean_diff', mean_diff: 20, ci_lower: 0.4, ci_upper: 39.6 },
      { measure: 'fisher_z', r: 0.5, n: 103 },
    ];
    for (const c of cases) {
      const r = computeEffect(c);
      expect(Object.keys(r)).toEqual(['measure', 'effect', 'variance', 'formula']);
      expect(r.measure).toBe(c.measure);
      expect(r.variance).toBeGreaterThan(0);
      expect(formulas[r.formula]).toBeDefined();
    }
    expect(computeEffect(cases[0]).effect).toBe(smdIndependent(103, 5.5, 50, 100, 4.5, 50).effect);
  });

  it('says which fields are missing and refuses unknown measures', () => {
    expect(() => computeEffect({ measure: 'smd', t: 2 })).toThrow(/smd needs one of these sets of fields/);
    expect(() => computeEffect({ measure: 'odds_ratio' })).toThrow(StatsInputError);
    expect(() => computeEffect({ measure: 'fisher_z', r: '0.5', n: 10 })).toThrow(/^r:/);
  });
});
