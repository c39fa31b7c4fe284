import { describe, expect, it } from 'vitest';
import { binomialDraw, bootstrapFit, createRandom, fitPsychometric, PsychophysicsInputError } from '../../../shared/psychophysics/index.js';

const x = [-200, -150, -100, -50, 0, 50, 100, 150, 200];
const n = x.map(() => 20);
const order = { x, n, k: [1, 2, 4, 7, 9, 13, 16, 18, 20], model: 'cumulative_gaussian' as const };
const window = { x: [-300, -200, -100, -50, 0, 50, 100, 200, 300], n, k: [1, 3, 10, 15, 18, 17, 16, 8, 2] };

describe('createRandom and binomialDraw', () => {
  it('the same seed gives the same stream; another seed another', () => {
    const a = createRandom(42);
    const b = createRandom(42);
    const c = createRandom(43);
    const sa = Array.from({ length: 50 }, a);
    expect(Array.from({ length: 50 }, b)).toEqual(sa);
    expect(Array.from({ length: 50 }, c)).not.toEqual(sa);
    expect(sa.every((u) => u >= 0 && u < 1)).toBe(true);
  });

  it('uniforms have mean ½ and variance 1/12', () => {
    const rnd = createRandom(1);
    const N = 200_000;
    let s = 0;
    let ss = 0;
    for (let i = 0; i < N; i++) {
      const u = rnd();
      s += u;
      ss += u * u;
    }
    const mean = s / N;
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / N));
    expect(Math.abs(ss / N - mean * mean - 1 / 12)).toBeLessThan(0.002);
  });

  // both branches: inversion (n·min(p, 1 − p) < 500) and the Bernoulli sum
  for (const [trials, p] of [[20, 0.03], [20, 0.5], [30, 0.97], [2000, 0.4], [5000, 0.8]] as const) {
    it(`Binomial(${trials}, ${p}) draws have mean np and variance np(1 − p)`, () => {
      const rnd = createRandom(trials);
      const N = trials > 1000 ? 4000 : 100_000;
      let s = 0;
      let ss = 0;
      let outside = 0;
      for (let i = 0; i < N; i++) {
        const v = binomialDraw(trials, p, rnd);
        if (!(Number.isInteger(v) && v >= 0 && v <= trials)) outside++;
        s += v;
        ss += v * v;
      }
      const mean = s / N;
      const variance = ss / N - mean * mean;
      const v0 = trials * p * (1 - p);
      expect(outside).toBe(0);
      expect(Math.abs(mean - trials * p)).toBeLessThan(4 * Math.sqrt(v0 / N));
      expect(Math.abs(variance / v0 - 1)).toBeLessThan(6 * Math.sqrt(2 / N));
    });
  }

  it('probabilities 0 and 1 give 0 and n', () => {
    const rnd = createRandom(3);
    expect(binomialDraw(12, 0, rnd)).toBe(0);
    expect(binomialDraw(12, 1, rnd)).toBe(12);
  });
});

describe('bootstrapFit', () => {
  it('a psychometric input (it has a model): intervals for pse, spread and jnd, none for a lapse not fitted', () => {
    const b = bootstrapFit(order, { resamples: 200, seed: 5 });
    expect(b.kind).toBe('psychometric');
    expect(b.fit).toEqual(fitPsychometric(order));
    expect(Object.keys(b.ci).sort()).toEqual(['jnd', 'lapse', 'pse', 'spread']);
    expect(b.ci.lapse).toBeNull();
    expect(b.resamples).toBe(200);
    expect(b.ci.pse.usable + b.failed).toBe(200);
    expect(b.ci.pse.lower!).toBeLessThan(b.fit.pse!);
    expect(b.ci.pse.upper!).toBeGreaterThan(b.fit.pse!);
    expect(b.ci.jnd.lower! / b.ci.spread.lower!).toBeCloseTo(0.6744897501960817, 12);
  });

  it('a fitted lapse rate gets an interval inside [0, 0.1]', () => {
    const b = bootstrapFit({ ...order, k: [0, 0, 1, 3, 10, 17, 18, 18, 19], lapse: true }, { resamples: 100, seed: 2 });
    expect(b.ci.lapse).not.toBeNull();
    expect(b.ci.lapse!.lower!).toBeGreaterThanOrEqual(0);
    expect(b.ci.lapse!.upper!).toBeLessThanOrEqual(0.1);
  });

  it('a simultaneity input (no model): intervals for centre, width, amplitude and sigma', () => {
    const b = bootstrapFit(window, { resamples: 200, seed: 5 });
    expect(b.kind).toBe('simultaneity');
    expect(Object.keys(b.ci).sort()).toEqual(['amplitude', 'centre', 'sigma', 'width']);
    if (b.kind !== 'simultaneity') throw new Error('unreachable');
    expect(b.ci.centre.lower!).toBeLessThan(b.fit.centre!);
    expect(b.ci.centre.upper!).toBeGreaterThan(b.fit.centre!);
    expect(b.ci.amplitude.upper!).toBeLessThanOrEqual(1);
  });

  it('is reproducible for a seed and changes with the seed', () => {
    const a = bootstrapFit(order, { resamples: 150, seed: 11 });
    expect(bootstrapFit(order, { resamples: 150, seed: 11 })).toEqual(a);
    expect(bootstrapFit(order, { resamples: 150, seed: 12 }).ci.pse).not.toEqual(a.ci.pse);
    expect(bootstrapFit(window, { resamples: 100, seed: 11 })).toEqual(bootstrapFit(window, { resamples: 100, seed: 11 }));
  });

  it('defaults to 1000 resamples, seed 1, level 0.95', () => {
    const b = bootstrapFit(order);
    expect([b.resamples, b.seed, b.level]).toEqual([1000, 1, 0.95]);
    expect(b.ci.pse.usable + b.failed).toBe(1000);
  });

  it('with many trials the bootstrap SD of the PSE approaches the delta-method SE', () => {
    const big = { ...order, n: x.map(() => 400), k: [18, 45, 85, 150, 195, 250, 320, 360, 385] };
    const b = bootstrapFit(big, { resamples: 2000, seed: 3 });
    expect(b.failed).toBe(0);
    expect(Math.abs(b.ci.pse.sd! / b.fit.se_pse! - 1)).toBeLessThan(0.08);
    expect(Math.abs(b.ci.spread.sd! / b.fit.se_spread! - 1)).toBeLessThan(0.08);
    // a narrower level gives a narrower interval
    const half = bootstrapFit(big, { resamples: 2000, seed: 3, level: 0.5 });
    expect(half.ci.pse.upper! - half.ci.pse.lower!).toBeLessThan(0.5 * (b.ci.pse.upper! - b.ci.pse.lower!));
  });

  it('leaves out refits without a finite maximum and counts them', () => {
    // steep and few trials: some simulated data sets are perfectly separated
    const steep = { x: [0, 10, 20, 30, 40], n: [4, 4, 4, 4, 4], k: [0, 1, 2, 3, 4], model: 'logistic' as const };
    const b = bootstrapFit(steep, { resamples: 300, seed: 9 });
    expect(b.failed).toBeGreaterThan(0);
    expect(b.ci.pse.usable).toBe(300 - b.failed);
  });

  it('when the data themselves have no finite maximum there is nothing to resample', () => {
    const b = bootstrapFit({ ...order, k: [0, 0, 0, 0, 20, 20, 20, 20, 20] }, { resamples: 50, seed: 1 });
    expect(b.fit.converged).toBe(false);
    expect(b.failed).toBe(50);
    expect(b.ci.pse).toEqual({ lower: null, upper: null, sd: null, usable: 0 });
  });

  it('refuses bad options and bad inputs', () => {
    expect(() => bootstrapFit(order, { resamples: 0 })).toThrow(/resamples must be a whole number/);
    expect(() => bootstrapFit(order, { resamples: 10.5 })).toThrow(PsychophysicsInputError);
    expect(() => bootstrapFit(order, { seed: -1 })).toThrow(/seed must be a whole number/);
    expect(() => bootstrapFit(order, { level: 1 })).toThrow(/level must be in \(0, 1\)/);
    expect(() => bootstrapFit({ ...order, model: 'probit' as never })).toThrow(/model must be one of/);
    expect(() => bootstrapFit(null as never)).toThrow(PsychophysicsInputError);
  });
});
