// The distribution helpers against scipy (Debian's /usr/bin/python3), including large df where jStat fails.
import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { tTwoTailed, tQuantileUpper, chiSquareUpperTail, chiSquareQuantile, normalTwoTailed, normalQuantileUpper } from '../../shared/stats/index.js';
import { tDensity } from '../../shared/stats/student-t.js';
import { relErr, runReference } from './python-reference.js';

const DFS = [1, 2, 3, 5, 10, 29, 99, 100, 341, 1000, 12_345, 100_000, 999_998];
const tCases = DFS.flatMap((df) => [0.05, 0.7, 1.96, 3, 6, 12].map((t) => [t, df] as [number, number]));
const tqCases = DFS.flatMap((df) => [0.25, 0.05, 0.025, 0.005, 1e-6].map((a) => [tQuantileUpper(a, df), a, df] as [number, number, number]));
const chiCases = DFS.flatMap((df) => [0.3, 0.9, 1, 1.1, 2].map((f) => [f * df, df] as [number, number]));
const chiqCases = DFS.flatMap((df) => [0.025, 0.5, 0.975].map((p) => [chiSquareQuantile(p, df), p, df] as [number, number, number]));
const zCases = [0.01, 0.5, 1.959963984540054, 3.1, 5, 8, 10, 20];
const zqCases = [0.4, 0.025, 1e-5, 1e-12].map((a) => [normalQuantileUpper(a), a] as [number, number]);

const ref = runReference<{ t: number[]; t_q: number[]; chi: number[]; chi_q: number[]; z: number[]; z_q: number[] }>(
  'scipy_distributions.py',
  { t: tCases, t_q: tqCases, chi: chiCases, chi_q: chiqCases, z: zCases, z_q: zqCases },
);

describe('t distribution against scipy (stdtr)', () => {
  it('two-tailed p to 1e-11 relative for df 1 … 10⁶ (jStat: ~2e-8)', () => {
    const bad = tCases.map(([t, df], i) => ({ t, df, e: relErr(tTwoTailed(t, df), ref.t[i]) })).filter((c) => !(c.e <= 1e-11));
    expect(bad).toEqual([]);
  });
  it('upper quantiles round-trip through scipy’s tail to 1e-11 relative', () => {
    const bad = tqCases.map(([q, a, df], i) => ({ q, a, df, e: relErr(ref.t_q[i], a) })).filter((c) => !(c.e <= 1e-11));
    expect(bad).toEqual([]);
  });
  it('the density stays finite and positive at df above 340, where jStat returns 0 or NaN', () => {
    for (const df of [341, 1e4, 1e6]) {
      const d = tDensity(1, df);
      expect(d).toBeGreaterThan(0.24);
      expect(d).toBeLessThan(0.2421); // the normal density at 1 is 0.24197…
    }
    expect(relErr(tDensity(0, 1), 1 / Math.PI)).toBeLessThan(1e-14);
  });
  it('df = 1 quantile equals tan(π(½ − α)) to 1e-14 (scipy’s own t quantile is off by 2e-11 here)', () => {
    expect(relErr(tQuantileUpper(0.025, 1), Math.tan(Math.PI * 0.475))).toBeLessThan(1e-14);
  });
});

describe('chi-square distribution against scipy (chdtrc)', () => {
  it('upper tail to 1e-12 relative for df 1 … 10⁶', () => {
    const bad = chiCases.map(([x, df], i) => ({ x, df, e: relErr(chiSquareUpperTail(x, df), ref.chi[i]) })).filter((c) => !(c.e <= 1e-12));
    expect(bad).toEqual([]);
  });
  it('quantiles round-trip through scipy’s cdf to 1e-12 relative', () => {
    const bad = chiqCases.map(([x, p, df], i) => ({ x, p, df, e: relErr(ref.chi_q[i], p) })).filter((c) => !(c.e <= 1e-12));
    expect(bad).toEqual([]);
  });
  it('a tail at df ≈ 10⁶ costs well under a millisecond (jStat iterates in proportion to df)', () => {
    const start = performance.now();
    for (let i = 0; i < 20; i++) chiSquareUpperTail(1_000_000 + 1000 * i, 999_999);
    expect((performance.now() - start) / 20).toBeLessThan(1);
  });
});

describe('normal distribution against scipy (ndtr)', () => {
  it('two-tailed p to 1e-13 relative, including z = 10 and 20 where jStat’s erfc underflows', () => {
    const bad = zCases.map((z, i) => ({ z, e: relErr(normalTwoTailed(z), ref.z[i]) })).filter((c) => !(c.e <= 1e-13));
    expect(bad).toEqual([]);
    expect(jStat.erfc(10 / Math.SQRT2)).toBe(0); // why the helper exists
  });
  it('upper quantiles round-trip to 1e-13 relative', () => {
    const bad = zqCases.map(([z, a], i) => ({ z, a, e: relErr(ref.z_q[i], a) })).filter((c) => !(c.e <= 1e-13));
    expect(bad).toEqual([]);
  });
});
