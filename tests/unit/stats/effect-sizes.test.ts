import { describe, expect, it } from 'vitest';
import {
  computeEffect, formulas, METRICS, EFFECT_METRICS, EFFECT_MEASURES, EFFECT_FIELDS, StatsInputError, smdFromT, smdFromF, smdFromP,
  smdPairedSds, dzFromPairedT, logRatio, logRatioPaired, percentChange, meanDifference, meanDifferenceFromT, meanDifferenceFromCi,
  meanDifferencePaired, rawMean, fisherZ, smdIndependent, hedgesCorrection, hedgesCorrectionApprox, meanSdFromMedian, normalQuantileUpper,
} from '../../../shared/stats/index.js';
import { effectInputSchema } from '../../../shared/schemas/compute.js';

/** Exact J from the gamma function written out for small integer df: Γ(m/2)/(√(m/2)·Γ((m−1)/2)). */
const J = (m: number) => hedgesCorrection(m);

// Hand computations from the formulas in each file's doc comment.
describe('effect sizes', () => {
  it('METRICS (the registry) and EFFECT_METRICS (what computeEffect reports)', () => {
    expect(METRICS).toEqual(EFFECT_METRICS);
    expect(EFFECT_METRICS).toEqual(['g_s', 'g_av', 'g_rm', 'g_z', 'log_ratio', 'mean_diff', 'raw_mean', 'fisher_z', 'log_odds_ratio']);
  });

  it("exact J: J(2) = 1/√π, J(3) and J(4) from Γ(3/2) = √π/2, and the approximation differs by 1.3% at df 2", () => {
    expect(J(2)).toBeCloseTo(1 / Math.sqrt(Math.PI), 13);
    // Γ(3/2)/(√(3/2)·Γ(1)) = (√π/2)/√1.5
    expect(J(3)).toBeCloseTo(Math.sqrt(Math.PI) / 2 / Math.sqrt(1.5), 13);
    // Γ(2)/(√2·Γ(3/2)) = 1/(√2·√π/2)
    expect(J(4)).toBeCloseTo(2 / (Math.sqrt(2) * Math.sqrt(Math.PI)), 13);
    expect(hedgesCorrectionApprox(2) / J(2) - 1).toBeCloseTo(0.0128, 4);
    // the Stirling branch (m ≥ 21) meets the direct branch and tends to the approximation at large df
    expect(J(21)).toBeCloseTo(Math.exp(lgammaDirect(10.5) - 0.5 * Math.log(10.5) - lgammaDirect(10)), 13);
    expect(J(1e6) - hedgesCorrectionApprox(1e6)).toBeLessThan(1e-12);
    expect(() => J(1)).toThrow(/df > 1/);
  });

  it('g_s from means: g = J(98)·d, V = 2/50 + g²/200 (Hedges & Olkin 1985)', () => {
    const r = smdIndependent(103, 5.5, 50, 100, 4.5, 50);
    const d = 3 / Math.sqrt((49 * 5.5 ** 2 + 49 * 4.5 ** 2) / 98);
    expect(r.effect).toBeCloseTo(J(98) * d, 14);
    expect(r.variance).toBeCloseTo(0.04 + r.effect ** 2 / 200, 14);
    expect(r).toMatchObject({ metric: 'g_s', hedges_j: { df: 98, form: 'exact' } });
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
    expect(r.effect).toBeCloseTo(-J(38) * 2.0243941639119702 * Math.sqrt(0.1), 9);
    expect(r.formula).toBe('smd.ind.p');
  });

  it('p = 1 and F = 0 give d = 0 without a direction; a p bound is kept and flagged', () => {
    for (const input of [{ p: 1 }, { F: 0 }]) {
      const r = computeEffect({ measure: 'smd', n1: 10, n2: 12, ...input });
      expect(r.effect).toBe(0);
      expect(r.variance).toBeCloseTo(1 / 10 + 1 / 12, 15);
    }
    const bound = computeEffect({ measure: 'smd', p_less_than: 0.001, n1: 10, n2: 12, direction: -1 });
    const exact = computeEffect({ measure: 'smd', p: 0.001, n1: 10, n2: 12, direction: -1 });
    expect(bound).toEqual({ ...exact, from_bound: true });
    expect(exact.from_bound).toBe(false);
    expect(computeEffect({ measure: 'smd_paired', p_less_than: 0.001, n: 20, direction: 1 })).toMatchObject({ metric: 'g_z', from_bound: true });
    expect(() => computeEffect({ measure: 'smd', p: 0.2, n1: 10, n2: 12 })).toThrow(/direction/);
    expect(() => computeEffect({ measure: 'smd', p: 0, n1: 10, n2: 12, direction: 1 })).toThrow(/p must be greater than 0/);
  });

  it('within subject: g_rm (Becker 1988 variance), g_av (Cousineau 2020), g_z (paired t with no r)', () => {
    const rm = computeEffect({ measure: 'smd_paired', mean_diff: 5, sd_diff: 10, n: 50, r: 0.5 });
    expect(rm.metric).toBe('g_rm');
    expect(rm.effect).toBeCloseTo(J(49) * 0.5, 15);
    expect(rm.variance).toBeCloseTo((2 * 0.5) / 50 + rm.effect ** 2 / 100, 15);

    const av = smdPairedSds(105, 10, 100, 10, 50, 0.5);
    expect(av.metric).toBe('g_av');
    expect(av.hedges_j!.df).toBeCloseTo(98 / 1.25, 15);
    expect(av.effect).toBeCloseTo(J(78.4) * 0.5, 14);
    expect(av.variance).toBeCloseTo(1 / 50 + (av.effect ** 2 * 1.25) / 200, 14);

    const dz = dzFromPairedT(0.5 * Math.sqrt(50), 50);
    expect(dz).toMatchObject({ metric: 'g_z', formula: 'smd.paired.dz_t' });
    expect(dz.effect).toBeCloseTo(0.5 * J(49), 14);
    expect(dz.variance).toBeCloseTo(1 / 50 + dz.effect ** 2 / 100, 14);
    expect(formulas['smd.paired.dz_t'].note).toMatch(/enter the correlation r/);

    // a paired t with r is the raw-score g_rm of the same data: d_rm = d_z·√(2(1 − r))
    const fromT = computeEffect({ measure: 'smd_paired', t: 0.5 * Math.sqrt(50), n: 50, r: 0.5 });
    expect(fromT.metric).toBe('g_rm');
    expect(fromT.effect).toBeCloseTo(rm.effect, 12);
    expect(fromT.variance).toBeCloseTo(rm.variance, 12);
    // without r the SD of the differences gives g_z, and d_z gives g_z from condition SDs and r
    expect(computeEffect({ measure: 'smd_paired', mean_diff: 5, sd_diff: 10, n: 50 }).metric).toBe('g_z');
    const fromSds = computeEffect({ measure: 'd_z', mean1: 105, sd1: 10, mean2: 100, sd2: 10, n: 50, r: 0.5 });
    expect(fromSds).toMatchObject({ metric: 'g_z', formula: 'smd.paired.dz_sds' });
    expect(fromSds.effect).toBeCloseTo(dz.effect, 12); // S_diff = √(100 + 100 − 100) = 10
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

  it('log ratio from a CI of a ratio or a percent change, on the scale the interval is centred on', () => {
    const z = normalQuantileUpper(0.025);
    // 1.2 [1.0, 1.44]: √(1.0·1.44) = 1.2, centred on the log scale
    const log = computeEffect({ measure: 'log_ratio', ratio: 1.2, ci_lower: 1, ci_upper: 1.44 });
    expect(log.formula).toBe('lnrom.ratio_ci.log');
    expect(log.effect).toBeCloseTo(Math.log(1.2), 15);
    expect(log.variance).toBeCloseTo((Math.log(1.44) / (2 * z)) ** 2, 14);
    // 12% [5%, 19%]: centred in percent, SE_p = 14/(2z), V = (SE_p/100)²/1.12²
    const pct = computeEffect({ measure: 'log_ratio', percent: 12, ci_lower: 5, ci_upper: 19 });
    expect(pct.formula).toBe('lnrom.percent_ci.linear');
    expect(pct.variance).toBeCloseTo((0.14 / (2 * z) / 1.12) ** 2, 14);
    // a t interval on df: the wider critical value means a smaller SE for the same limits
    const t = computeEffect({ measure: 'log_ratio', ratio: 1.2, ci_lower: 1, ci_upper: 1.44, df: 19 });
    expect(t.variance).toBeLessThan(log.variance);
    expect(() => computeEffect({ measure: 'log_ratio', ratio: 1.2, ci_lower: 1.1, ci_upper: 1.6 })).toThrow(/not centred on ratio 1.2 on either scale \(halves 0.087 and 0.288 on the log scale, 0.1 and 0.4 in ratio units\)/);
    expect(() => computeEffect({ measure: 'log_ratio', ratio: 0.9, ci_lower: -0.1, ci_upper: 1.9 })).toThrow(/ci_lower must be positive/);
  });

  it('raw mean differences from SDs, SEs, t, a centred CI and paired differences; raw means; Fisher z', () => {
    expect(meanDifference(103, 5.5, 50, 100, 4.5, 50)).toMatchObject({ effect: 3, metric: 'mean_diff', formula: 'md.ind.sds' });
    expect(meanDifference(103, 5.5, 50, 100, 4.5, 50).variance).toBeCloseTo(1.01, 14);
    expect(computeEffect({ measure: 'mean_diff', mean1: 103, se1: 0.5, mean2: 100, se2: 0.25 })).toMatchObject({ effect: 3, variance: 0.3125, formula: 'md.ind.ses' });
    expect(computeEffect({ measure: 'mean_diff', mean_diff: 20, se: 10 }).variance).toBe(100);
    expect(meanDifferenceFromT(20, 2.5).variance).toBeCloseTo(64, 12);
    expect(meanDifferenceFromCi(20, 0.4, 39.6).variance).toBeCloseTo((39.2 / (2 * 1.959963984540054)) ** 2, 10);
    expect(meanDifferenceFromCi(20, 0.4, 39.6, 0.95, 10).formula).toBe('md.ci.t');
    expect(meanDifferencePaired(5, 10, 50).variance).toBeCloseTo(2, 14);
    expect(rawMean(250, 60, 24)).toMatchObject({ effect: 250, variance: 150, metric: 'raw_mean' });
    expect(computeEffect({ measure: 'raw_mean', mean: 250, se: 12.5 })).toMatchObject({ metric: 'raw_mean', variance: 156.25, formula: 'mean.raw.se' });
    expect(fisherZ(0.5, 103).effect).toBeCloseTo(0.5493061443340548, 15);
    expect(fisherZ(0.5, 103).variance).toBeCloseTo(0.01, 15);
  });

  it('SE instead of SD for two groups: SD = SE·√n gives the same g as the SDs', () => {
    const sd = computeEffect({ measure: 'smd', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 });
    const se = computeEffect({ measure: 'smd', mean1: 103, se1: 5.5 / Math.sqrt(50), n1: 50, mean2: 100, se2: 4.5 / Math.sqrt(50), n2: 50 });
    expect(se.formula).toBe('smd.ind.means.ses');
    expect(se.effect).toBeCloseTo(sd.effect, 13);
    expect(se.variance).toBeCloseTo(sd.variance, 13);
  });

  it('a CI not centred on its mean difference is refused and says so; a rounded one is accepted', () => {
    expect(() => computeEffect({ measure: 'mean_diff', mean_diff: 12, ci_lower: 1, ci_upper: 30 })).toThrow(/not centred on mean_diff 12 \(halves 11 and 18\)/);
    // integers rounded to 1 ms: halves 2 and 3 are within rounding
    expect(computeEffect({ measure: 'mean_diff', mean_diff: 250, ci_lower: 248, ci_upper: 253 }).formula).toBe('md.ci.z');
  });

  it('medians with quartiles or range (Wan et al. 2014), flagged approximate', () => {
    const n = 40;
    const eta = 2 * normalQuantileUpper(1 - (0.75 * n - 0.125) / (n + 0.25));
    const xi = 2 * normalQuantileUpper(1 - (n - 0.375) / (n + 0.25));
    expect(meanSdFromMedian({ median: 10, lower_quartile: 8, upper_quartile: 13, n })).toEqual({ mean: 31 / 3, sd: 5 / eta });
    expect(meanSdFromMedian({ median: 10, min: 2, max: 20, n })).toEqual({ mean: 10.5, sd: 18 / xi });
    const both = meanSdFromMedian({ median: 10, lower_quartile: 8, upper_quartile: 13, min: 2, max: 20, n });
    expect(both.mean).toBeCloseTo((2 + 16 + 20 + 26 + 20) / 8, 14);
    expect(both.sd).toBeCloseTo(18 / (2 * xi) + 5 / (2 * eta), 14);
    // η(40) ≈ 1.3 (Wan et al. 2014 Table: about 1.35 for large n)
    expect(eta).toBeGreaterThan(1.3);
    expect(eta).toBeLessThan(1.35);
    const r = computeEffect({ measure: 'smd', median1: 10, lower_quartile1: 8, upper_quartile1: 13, n1: n, mean2: 9, sd2: 3, n2: n });
    expect(r).toMatchObject({ metric: 'g_s', formula: 'smd.ind.means.medians', approximate: true });
    expect(r.effect).toBeCloseTo(smdIndependent(31 / 3, 5 / eta, n, 9, 3, n).effect, 14);
    const raw = computeEffect({ measure: 'raw_mean', median: 10, min: 2, max: 20, n });
    expect(raw).toMatchObject({ formula: 'mean.raw.median', approximate: true, effect: 10.5 });
    expect(() => computeEffect({ measure: 'raw_mean', median: 10, lower_quartile: 11, upper_quartile: 13, n })).toThrow(/lower_quartile ≤ median/);
  });

  it('2×2 counts: log odds ratio (0.5 added only with a zero cell) and d by Chinn (2000)', () => {
    const lor = computeEffect({ measure: 'log_odds_ratio', events1: 4, nonevents1: 119, events2: 11, nonevents2: 128 });
    expect(lor).toMatchObject({ metric: 'log_odds_ratio', formula: 'lnor.counts' });
    expect(lor.effect).toBeCloseTo(Math.log((4 * 128) / (119 * 11)), 15);
    expect(lor.variance).toBeCloseTo(1 / 4 + 1 / 119 + 1 / 11 + 1 / 128, 15);
    expect(computeEffect({ measure: 'log_odds_ratio', events1: 4, n1: 123, events2: 11, n2: 139 }).effect).toBe(lor.effect);
    const zero = computeEffect({ measure: 'log_odds_ratio', events1: 0, nonevents1: 20, events2: 5, nonevents2: 15 });
    expect(zero.formula).toBe('lnor.counts.corrected');
    expect(zero.effect).toBeCloseTo(Math.log((0.5 * 15.5) / (20.5 * 5.5)), 15);
    const d = computeEffect({ measure: 'smd', events1: 4, nonevents1: 119, events2: 11, nonevents2: 128 });
    expect(d).toMatchObject({ metric: 'g_s', formula: 'smd.ind.counts', hedges_j: null });
    expect(d.effect).toBeCloseTo((lor.effect * Math.sqrt(3)) / Math.PI, 15);
    expect(d.variance).toBeCloseTo((lor.variance * 3) / Math.PI ** 2, 15);
    expect(() => computeEffect({ measure: 'log_odds_ratio', events1: 4.5, nonevents1: 1, events2: 1, nonevents2: 1 })).toThrow(/events1 must be a whole number/);
    expect(() => computeEffect({ measure: 'log_odds_ratio', events1: 5, n1: 4, events2: 1, n2: 3 })).toThrow(/events1 must not exceed n1/);
  });

  it('every formula id used has a label, metric, expression and source; the metric agrees with the result', () => {
    const results = [
      smdIndependent(1, 1, 5, 0, 1, 5), smdFromT(1, 5, 5), smdFromF(1, 5, 5, 1), smdFromP(0.2, 5, 5, 1), smdPairedSds(1, 1, 0, 1, 5, 0.5),
      dzFromPairedT(1, 5), logRatio(2, 1, 5, 1, 1, 5), logRatioPaired(2, 1, 1, 1, 5, 0.5), percentChange(5, 1), meanDifference(1, 1, 5, 0, 1, 5),
      meanDifferenceFromT(1, 1), meanDifferenceFromCi(1, 0, 2), meanDifferenceFromCi(1, 0, 2, 0.95, 5), meanDifferencePaired(1, 1, 5), rawMean(1, 1, 5), fisherZ(0.1, 10),
      ...[
        { measure: 'smd', mean1: 1, se1: 1, n1: 5, mean2: 0, sd2: 1, n2: 5 }, { measure: 'smd', events1: 1, nonevents1: 4, events2: 0, nonevents2: 5 },
        { measure: 'smd', events1: 1, nonevents1: 4, events2: 2, nonevents2: 5 }, { measure: 'smd', median1: 1, min1: 0, max1: 3, n1: 5, mean2: 0, sd2: 1, n2: 5 },
        { measure: 'smd_paired', mean_diff: 1, sd_diff: 1, n: 5, r: 0.3 }, { measure: 'smd_paired', t: 1, n: 5, r: 0.3 },
        { measure: 'smd_paired', p: 0.3, n: 5, r: 0.3, direction: 1 }, { measure: 'd_z', mean_diff: 1, sd_diff: 1, n: 5 },
        { measure: 'd_z', mean1: 1, sd1: 1, mean2: 0, sd2: 1, n: 5, r: 0.3 }, { measure: 'd_z', p: 0.3, n: 5, direction: 1 },
        { measure: 'log_ratio', mean1: 2, se1: 0.5, n1: 5, mean2: 1, sd2: 1, n2: 5 }, { measure: 'log_ratio', median1: 2, min1: 1, max1: 3, n1: 5, mean2: 1, sd2: 1, n2: 5 },
        { measure: 'log_ratio', ratio: 1.2, ci_lower: 1, ci_upper: 1.44 }, { measure: 'log_ratio', ratio: 1.12, ci_lower: 1.05, ci_upper: 1.19 },
        { measure: 'log_ratio', percent: 20, ci_lower: 0, ci_upper: 44 }, { measure: 'log_ratio', percent: 12, ci_lower: 5, ci_upper: 19 },
        { measure: 'mean_diff', mean1: 1, se1: 1, n1: 5, mean2: 0, sd2: 1, n2: 5 }, { measure: 'mean_diff', mean1: 1, se1: 1, mean2: 0, se2: 1 },
        { measure: 'mean_diff', median1: 1, lower_quartile1: 0, upper_quartile1: 2, n1: 5, mean2: 0, sd2: 1, n2: 5 }, { measure: 'mean_diff', mean_diff: 1, se: 1 },
        { measure: 'raw_mean', mean: 1, se: 1 }, { measure: 'raw_mean', median: 1, min: 0, max: 2, n: 5 },
        { measure: 'log_odds_ratio', events1: 1, nonevents1: 4, events2: 2, nonevents2: 5 }, { measure: 'log_odds_ratio', events1: 0, nonevents1: 4, events2: 2, nonevents2: 5 },
      ].map((c) => computeEffect(c)),
    ];
    const ids = new Set<string>();
    for (const r of results) {
      const info = formulas[r.formula];
      expect(info, r.formula).toBeDefined();
      expect(info.metric, r.formula).toBe(r.metric);
      expect(info.expression.length).toBeGreaterThan(5);
      expect(info.source).toMatch(/\d{4}/);
      if (r.metric.startsWith('g_') && r.formula.startsWith('smd.ind.counts') === false) expect(info.expression).toMatch(/exact/);
      ids.add(r.formula);
    }
    expect(ids.size).toBe(Object.keys(formulas).length);
  });

  it('invalid values are refused by name; n = 1 with an SD is refused', () => {
    expect(() => smdIndependent(1, -1, 5, 0, 1, 5)).toThrow(/sd1 must be a positive finite number/);
    expect(() => smdIndependent(1, 1, 5.5, 0, 1, 5)).toThrow(/n1 must be a whole number/);
    expect(() => fisherZ(1, 10)).toThrow(/r must be a correlation/);
    expect(() => logRatio(-1, 1, 5, 1, 1, 5)).toThrow(/mean1 must be a positive/);
    expect(() => meanDifferenceFromT(5, -1)).toThrow(/same sign/);
    expect(() => smdFromF(4, 10, 10, 0 as never)).toThrow(/direction/);
    expect(() => percentChange(-100, 1)).toThrow(StatsInputError);
    for (const input of [
      { measure: 'mean_diff', mean1: 1, sd1: 1, n1: 1, mean2: 0, sd2: 1, n2: 5 },
      { measure: 'log_ratio', mean1: 2, sd1: 1, n1: 5, mean2: 1, sd2: 1, n2: 1 },
      { measure: 'raw_mean', mean: 1, sd: 1, n: 1 },
      { measure: 'smd', mean1: 1, sd1: 1, n1: 1, mean2: 0, sd2: 1, n2: 5 },
    ]) expect(() => computeEffect(input)).toThrow(/= 1 cannot come with a standard deviation/);
    expect(() => computeEffect({ measure: 'smd_paired', t: 2, n: 2 })).toThrow(/n must be a whole number of at least 3/);
  });
});

describe('computeEffect (the CLI and route shape)', () => {
  const cases = [
    { measure: 'smd', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 },
    { measure: 'smd', t: 2.5, n1: 20, n2: 22 },
    { measure: 'smd_paired', mean1: 105, sd1: 10, mean2: 100, sd2: 10, n: 50, r: 0.5 },
    { measure: 'd_z', t: 2.5, n: 20 },
    { measure: 'log_ratio', mean1: 1100, sd1: 200, n1: 20, mean2: 1000, sd2: 180, n2: 20 },
    { measure: 'log_ratio_paired', mean1: 1100, sd1: 200, mean2: 1000, sd2: 180, n: 20, r: 0.5 },
    { measure: 'mean_diff', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 },
    { measure: 'mean_diff', mean_diff: 20, ci_lower: 0.4, ci_upper: 39.6 },
    { measure: 'raw_mean', mean: 250, sd: 60, n: 24 },
    { measure: 'fisher_z', r: 0.5, n: 103 },
    { measure: 'log_odds_ratio', events1: 4, nonevents1: 119, events2: 11, nonevents2: 128 },
  ];

  it('returns { measure, metric, effect, variance, formula, hedges_j, from_bound, approximate } for each measure', () => {
    for (const c of cases) {
      const r = computeEffect(c);
      expect(Object.keys(r)).toEqual(['measure', 'metric', 'effect', 'variance', 'formula', 'hedges_j', 'from_bound', 'approximate']);
      expect(r.measure).toBe(c.measure);
      expect(r.variance).toBeGreaterThan(0);
      expect(formulas[r.formula]).toBeDefined();
      expect(r.hedges_j === null).toBe(!r.metric.startsWith('g_'));
    }
    expect(new Set(cases.map((c) => c.measure))).toEqual(new Set(EFFECT_MEASURES));
    expect(computeEffect(cases[0]).effect).toBe(smdIndependent(103, 5.5, 50, 100, 4.5, 50).effect);
  });

  it('says which fields are missing and refuses unknown measures and non-numbers by name', () => {
    expect(() => computeEffect({ measure: 'smd', t: 2 })).toThrow(/smd needs one of these sets of fields/);
    expect(() => computeEffect({ measure: 'odds_ratio' })).toThrow(/measure must be one of/);
    expect(() => computeEffect({ measure: 'fisher_z', r: '0.5', n: 10 })).toThrow(/^r must be a finite number \(got "0.5"\)/);
    expect(() => computeEffect({ measure: 'smd', p: 0.5, n1: 5, n2: 5, direction: 2 })).toThrow(/direction must be 1/);
    expect(() => computeEffect(null)).toThrow(StatsInputError);
    try {
      computeEffect({ measure: 'mean_diff', mean_diff: 1, se: Infinity });
    } catch (e) {
      expect((e as StatsInputError).field).toBe('se');
    }
  });

  it('the zod schema in shared/schemas and the plain check in shared/stats accept and refuse the same shapes', () => {
    const shapes: unknown[] = [
      ...cases,
      { measure: 'smd', p: 0.5, n1: 5, n2: 5, direction: 2 },
      { measure: 'fisher_z', r: '0.5', n: 10 },
      { measure: 'fisher_z', r: null, n: 10 },
      { measure: 'fisher_z', r: 0.5, n: Infinity },
      { measure: 'nope' },
      { r: 0.5 },
      null,
      [],
      { measure: 'raw_mean', mean: 1, se: 1, unrelated: 'ignored' },
    ];
    for (const shape of shapes) {
      const zodOk = effectInputSchema.safeParse(shape).success;
      let plainOk = true;
      try {
        computeEffect(shape);
      } catch (e) {
        if (!(e instanceof StatsInputError)) throw e;
        plainOk = !/must be a finite number|must be one of|must be an object|direction must be/.test(e.message);
      }
      expect(plainOk, JSON.stringify(shape)).toBe(zodOk);
    }
    // every field the engine reads is in the schema, and no other
    for (const m of EFFECT_MEASURES) {
      const option = effectInputSchema.options.find((o) => (o.shape.measure as unknown as { value: string }).value === m)!;
      expect(Object.keys(option.shape).filter((k) => k !== 'measure').sort()).toEqual([...EFFECT_FIELDS[m]].sort());
    }
  });
});

/** ln Γ by the Lanczos-free route Γ(x) = (x−1)! for integers and Γ(n + ½) = (2n)!√π/(4ⁿn!), enough for the check at 10 and 10.5. */
function lgammaDirect(x: number): number {
  const fact = (k: number) => { let f = 1; for (let i = 2; i <= k; i++) f *= i; return f; };
  if (Number.isInteger(x)) return Math.log(fact(x - 1));
  const n = x - 0.5;
  return Math.log((fact(2 * n) * Math.sqrt(Math.PI)) / (4 ** n * fact(n)));
}
