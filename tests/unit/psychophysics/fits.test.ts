import { describe, expect, it } from 'vitest';
import { fitPsychometric, fitSimultaneity, PsychophysicsInputError, type PsychometricFit, type SimultaneityFit } from '../../../shared/psychophysics/index.js';
import { normalTwoTailed } from '../../../shared/stats/normal.js';
import { mulberry32 } from '../../support/random.js';

const PSYCHOMETRIC_FIELDS = ['model', 'pse', 'se_pse', 'spread', 'se_spread', 'jnd', 'lapse', 'deviance', 'df', 'loglik', 'converged', 'iterations'];
const SIMULTANEITY_FIELDS = ['centre', 'se_centre', 'width', 'se_width', 'amplitude', 'sigma', 'deviance', 'df', 'loglik', 'converged'];
const PSYCHOMETRIC_ESTIMATES = ['pse', 'se_pse', 'spread', 'se_spread', 'jnd', 'lapse'] as const;
const SIMULTANEITY_ESTIMATES = ['centre', 'se_centre', 'width', 'se_width', 'amplitude', 'sigma'] as const;

const x = [-200, -150, -100, -50, 0, 50, 100, 150, 200];
const n = x.map(() => 20);
const k = [1, 2, 4, 7, 9, 13, 16, 18, 20];
const window = { x: [-300, -200, -100, -50, 0, 50, 100, 200, 300], n, k: [1, 3, 10, 15, 18, 17, 16, 8, 2] };
const phi = (z: number) => (z < 0 ? 0.5 * normalTwoTailed(z) : 1 - 0.5 * normalTwoTailed(z));

/** Every number is finite; estimates are numbers when converged and all null when not. */
function wellFormedPsychometric(f: PsychometricFit) {
  expect(Object.keys(f).sort()).toEqual([...PSYCHOMETRIC_FIELDS].sort());
  for (const key of ['deviance', 'df', 'loglik', 'iterations'] as const) expect(Number.isFinite(f[key])).toBe(true);
  for (const key of PSYCHOMETRIC_ESTIMATES) {
    const v = f[key];
    if (f.converged) expect(v === null || Number.isFinite(v), `${key} = ${v}`).toBe(true);
    else expect(v).toBeNull();
  }
  if (f.converged) for (const key of ['pse', 'spread', 'jnd', 'lapse'] as const) expect(f[key]).not.toBeNull();
}

function wellFormedSimultaneity(f: SimultaneityFit) {
  expect(Object.keys(f).sort()).toEqual([...SIMULTANEITY_FIELDS].sort());
  for (const key of ['deviance', 'df', 'loglik'] as const) expect(Number.isFinite(f[key])).toBe(true);
  for (const key of SIMULTANEITY_ESTIMATES) {
    const v = f[key];
    if (f.converged) expect(v === null || Number.isFinite(v), `${key} = ${v}`).toBe(true);
    else expect(v).toBeNull();
  }
}

describe('fitPsychometric: the contract', () => {
  it('returns exactly the contract fields; lapse false and guess 0 by default', () => {
    const f = fitPsychometric({ x, n, k, model: 'cumulative_gaussian' });
    wellFormedPsychometric(f);
    expect(f).toMatchObject({ model: 'cumulative_gaussian', lapse: 0, df: 7, converged: true });
    expect(f.iterations).toBeGreaterThan(0);
    expect(fitPsychometric({ x, n, k, model: 'logistic', lapse: true }).df).toBe(6);
  });

  it('jnd is the 75% point minus the 50% point of F', () => {
    const g = fitPsychometric({ x, n, k, model: 'cumulative_gaussian' });
    expect(phi(g.jnd! / g.spread!)).toBeCloseTo(0.75, 14);
    const l = fitPsychometric({ x, n, k, model: 'logistic' });
    expect(1 / (1 + Math.exp(-l.jnd! / l.spread!))).toBeCloseTo(0.75, 14);
  });

  it('follows the stimulus axis: a shift moves the PSE only, a change of unit scales pse, spread and SEs', () => {
    const base = fitPsychometric({ x, n, k, model: 'cumulative_gaussian' });
    const shifted = fitPsychometric({ x: x.map((v) => v + 500), n, k, model: 'cumulative_gaussian' });
    expect(shifted.pse! - 500).toBeCloseTo(base.pse!, 8);
    expect(shifted.spread).toBeCloseTo(base.spread!, 8);
    expect(shifted.se_pse).toBeCloseTo(base.se_pse!, 8);
    const seconds = fitPsychometric({ x: x.map((v) => v / 1000), n, k, model: 'cumulative_gaussian' });
    expect(seconds.pse! * 1000).toBeCloseTo(base.pse!, 8);
    expect(seconds.se_spread! * 1000).toBeCloseTo(base.se_spread!, 8);
    expect(seconds.loglik).toBeCloseTo(base.loglik, 10);
  });

  it('a falling curve mirrors the rising one: spread and jnd change sign', () => {
    const up = fitPsychometric({ x, n, k, model: 'logistic' });
    const down = fitPsychometric({ x: x.map((v) => -v), n, k, model: 'logistic' });
    expect(down.pse).toBeCloseTo(-up.pse!, 8);
    expect(down.spread).toBeCloseTo(-up.spread!, 8);
    expect(down.jnd).toBeLessThan(0);
    expect(down.se_spread).toBeCloseTo(up.se_spread!, 8);
  });

  it('a lapse rate absorbs misses at the top, and its bound holds', () => {
    const misses = [0, 0, 1, 3, 10, 17, 18, 18, 18];
    const plain = fitPsychometric({ x, n, k: misses, model: 'cumulative_gaussian' });
    const withLapse = fitPsychometric({ x, n, k: misses, model: 'cumulative_gaussian', lapse: true });
    expect(withLapse.converged).toBe(true);
    expect(withLapse.lapse).toBeGreaterThan(0.05);
    expect(withLapse.lapse).toBeLessThanOrEqual(0.1);
    expect(withLapse.loglik).toBeGreaterThan(plain.loglik);
    expect(Math.abs(withLapse.spread!)).toBeLessThan(Math.abs(plain.spread!));
    const many = fitPsychometric({ x, n, k: [0, 0, 1, 3, 9, 14, 15, 15, 15], model: 'cumulative_gaussian', lapse: true });
    expect(many.lapse).toBe(0.1);
  });
});

describe('fitPsychometric: degenerate data never gives NaN', () => {
  const cases: [string, number[]][] = [
    ['all 0', x.map(() => 0)],
    ['all 1', n],
    ['perfect separation', [0, 0, 0, 0, 20, 20, 20, 20, 20]],
    ['quasi-complete separation (one mixed level)', [0, 0, 0, 0, 7, 20, 20, 20, 20]],
    ['separation, falling', [20, 20, 20, 20, 0, 0, 0, 0, 0]],
  ];
  for (const [name, counts] of cases) {
    for (const model of ['cumulative_gaussian', 'logistic'] as const) {
      it(`${name} (${model}): converged false, estimates null, deviance and loglik at the supremum`, () => {
        const f = fitPsychometric({ x, n, k: counts, model });
        wellFormedPsychometric(f);
        expect(f.converged).toBe(false);
        expect(f.deviance).toBeCloseTo(0, 12); // the supremum is the saturated fit
      });
    }
  }

  it('overlap by one answer is enough for a finite maximum', () => {
    const f = fitPsychometric({ x, n, k: [0, 0, 0, 1, 0, 20, 20, 20, 20], model: 'logistic' });
    wellFormedPsychometric(f);
    expect(f.converged).toBe(true);
  });

  it('with a guess rate, answers all at or below chance have no finite maximum', () => {
    const f = fitPsychometric({ x, n, k: [5, 8, 9, 10, 10, 9, 10, 10, 10], model: 'logistic', guess: 0.5 });
    wellFormedPsychometric(f);
    expect(f.converged).toBe(false);
  });

  it('separation once the lapses are allowed for: converged false', () => {
    const counts = [0, 0, 0, 0, 20, 20, 20, 20, 19];
    expect(fitPsychometric({ x, n, k: counts, model: 'cumulative_gaussian' }).converged).toBe(true);
    const f = fitPsychometric({ x, n, k: counts, model: 'cumulative_gaussian', lapse: true });
    wellFormedPsychometric(f);
    expect(f.converged).toBe(false);
  });

  it('random tiny data sets: every result well formed', () => {
    const rnd = mulberry32(99);
    let converged = 0;
    let failed = 0;
    for (let t = 0; t < 600; t++) {
      const levels = 3 + Math.floor(rnd() * 4);
      const xs = Array.from({ length: levels }, (_, i) => i * 10);
      const ns = xs.map(() => 1 + Math.floor(rnd() * 5));
      const ks = ns.map((v) => Math.floor(rnd() * (v + 1)));
      const model = t % 2 ? 'logistic' : 'cumulative_gaussian';
      const f = fitPsychometric({ x: xs, n: ns, k: ks, model, lapse: t % 3 === 0, guess: t % 5 === 0 ? 0.5 : 0 });
      wellFormedPsychometric(f);
      if (f.converged) converged++;
      else failed++;
    }
    expect(converged).toBeGreaterThan(50);
    expect(failed).toBeGreaterThan(50);
  });
});

describe('fitPsychometric: bad input is refused with a clear message', () => {
  const ok = { x, n, k, model: 'logistic' as const };
  const bad: [string, unknown, RegExp][] = [
    ['one level', { ...ok, x: [5], n: [10], k: [3] }, /at least 2 distinct stimulus levels \(got 1\)/],
    ['one level, repeated', { ...ok, x: [5, 5, 5], n: [10, 10, 10], k: [3, 4, 5] }, /at least 2 distinct/],
    ['two levels with a lapse rate', { ...ok, x: [1, 2], n: [10, 10], k: [3, 7], lapse: true }, /at least 3 distinct/],
    ['lengths differ', { ...ok, k: k.slice(1) }, /same length \(got 9, 9, 8\)/],
    ['empty', { ...ok, x: [], n: [], k: [] }, /empty/],
    ['k above n', { ...ok, k: [...k.slice(0, 8), 21] }, /k\[8\] must be a whole count between 0 and n\[8\] = 20/],
    ['negative k', { ...ok, k: [-1, ...k.slice(1)] }, /k\[0\]/],
    ['fractional n', { ...ok, n: [20.5, ...n.slice(1)] }, /n\[0\] must be a whole number of trials/],
    ['zero trials', { ...ok, n: [0, ...n.slice(1)], k: [0, ...k.slice(1)] }, /n\[0\]/],
    ['NaN level', { ...ok, x: [NaN, ...x.slice(1)] }, /x\[0\] must be a finite number/],
    ['unknown model', { ...ok, model: 'weibull' }, /model must be one of cumulative_gaussian, logistic/],
    ['guess out of range', { ...ok, guess: 0.95 }, /guess must be a number in \[0, 0.9\)/],
    ['lapse not boolean', { ...ok, lapse: 'yes' }, /lapse must be true or false/],
    ['not arrays', { ...ok, x: 'abc' }, /x must be an array/],
  ];
  for (const [name, input, message] of bad) {
    it(name, () => {
      expect(() => fitPsychometric(input as never)).toThrow(PsychophysicsInputError);
      expect(() => fitPsychometric(input as never)).toThrow(message);
    });
  }
});

describe('fitSimultaneity', () => {
  it('returns exactly the contract fields; width is where the window is at least 0.5', () => {
    const f = fitSimultaneity(window);
    wellFormedSimultaneity(f);
    expect(f.converged).toBe(true);
    expect(f.df).toBe(6);
    const p = (v: number) => f.amplitude! * Math.exp(-((v - f.centre!) ** 2) / (2 * f.sigma! ** 2));
    expect(p(f.centre! + f.width! / 2)).toBeCloseTo(0.5, 12);
    expect(p(f.centre! - f.width! / 2)).toBeCloseTo(0.5, 12);
  });

  it('a peak below 0.5 has no width', () => {
    const f = fitSimultaneity({ ...window, k: [0, 1, 3, 5, 7, 6, 4, 1, 0] });
    wellFormedSimultaneity(f);
    expect(f.converged).toBe(true);
    expect(f.amplitude).toBeLessThan(0.5);
    expect(f.width).toBeNull();
    expect(f.se_width).toBeNull();
    expect(f.se_centre).toBeGreaterThan(0);
  });

  it('an amplitude at its bound of 1 is held there', () => {
    const f = fitSimultaneity({ ...window, k: [0, 2, 12, 20, 20, 20, 20, 14, 3] });
    expect(f.converged).toBe(true);
    expect(f.amplitude).toBe(1);
    expect(f.se_width).toBeGreaterThan(0);
  });

  it('follows the stimulus axis', () => {
    const base = fitSimultaneity(window);
    const shifted = fitSimultaneity({ ...window, x: window.x.map((v) => v - 80) });
    expect(shifted.centre! + 80).toBeCloseTo(base.centre!, 7);
    expect(shifted.width).toBeCloseTo(base.width!, 7);
    expect(shifted.se_width).toBeCloseTo(base.se_width!, 7);
  });

  const degenerate: [string, number[]][] = [
    ['no "simultaneous" answers', window.x.map(() => 0)],
    ['all "simultaneous"', n],
    ['answers at one level only', [0, 0, 0, 0, 12, 0, 0, 0, 0]],
  ];
  for (const [name, counts] of degenerate) {
    it(`${name}: converged false, estimates null, never NaN`, () => {
      const f = fitSimultaneity({ ...window, k: counts });
      wellFormedSimultaneity(f);
      expect(f.converged).toBe(false);
      expect(f.deviance).toBeCloseTo(0, 12);
    });
  }

  it('random tiny data sets: every result well formed', () => {
    const rnd = mulberry32(7);
    for (let t = 0; t < 300; t++) {
      const levels = 3 + Math.floor(rnd() * 5);
      const xs = Array.from({ length: levels }, (_, i) => i * 40 - 100);
      const ns = xs.map(() => 1 + Math.floor(rnd() * 6));
      wellFormedSimultaneity(fitSimultaneity({ x: xs, n: ns, k: ns.map((v) => Math.floor(rnd() * (v + 1))) }));
    }
  });

  it('needs three distinct levels', () => {
    expect(() => fitSimultaneity({ x: [0, 100], n: [10, 10], k: [5, 3] })).toThrow(/at least 3 distinct stimulus levels \(got 2\)/);
    expect(() => fitSimultaneity({ x: [0, 100, 200], n: [10, 10, 10], k: [5, 11, 3] })).toThrow(PsychophysicsInputError);
  });
});
