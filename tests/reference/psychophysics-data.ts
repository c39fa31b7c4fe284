// Invented, seeded trial counts for the psychophysics reference checks (mulberry32 streams, Bernoulli sums).
import { mulberry32 } from '../support/random.js';
import { normalTwoTailed } from '../../shared/stats/normal.js';

export interface CountsSet {
  name: string;
  x: number[];
  n: number[];
  k: number[];
}

const phi = (z: number) => (z < 0 ? 0.5 * normalTwoTailed(z) : 1 - 0.5 * normalTwoTailed(z));
const logistic = (z: number) => 1 / (1 + Math.exp(-z));

function draw(rnd: () => number, n: number, p: number): number {
  let k = 0;
  for (let i = 0; i < n; i++) if (rnd() < p) k++;
  return k;
}

export function range(from: number, to: number, step: number): number[] {
  const out: number[] = [];
  for (let v = from; v <= to + 1e-9; v += step) out.push(v);
  return out;
}

interface Truth {
  pse: number;
  spread: number;
  model?: 'cumulative_gaussian' | 'logistic';
  lapse?: number;
  guess?: number;
}

/** Counts from p(x) = guess + (1 − guess − lapse)·F((x − pse)/spread). */
export function psychometricSet(name: string, seed: number, x: number[], n: number | number[], t: Truth): CountsSet {
  const rnd = mulberry32(seed);
  const F = t.model === 'logistic' ? logistic : phi;
  const g = t.guess ?? 0;
  const l = t.lapse ?? 0;
  const ns = typeof n === 'number' ? x.map(() => n) : n;
  const k = x.map((xi, i) => draw(rnd, ns[i], g + (1 - g - l) * F((xi - t.pse) / t.spread)));
  return { name, x, n: ns, k };
}

/** Counts from p(x) = A·exp(−(x − centre)²/(2σ²)). */
export function simultaneitySet(name: string, seed: number, x: number[], n: number | number[], centre: number, sigma: number, A: number): CountsSet {
  const rnd = mulberry32(seed);
  const ns = typeof n === 'number' ? x.map(() => n) : n;
  const k = x.map((xi, i) => draw(rnd, ns[i], A * Math.exp(-((xi - centre) ** 2) / (2 * sigma * sigma))));
  return { name, x, n: ns, k };
}

/** Data sets for the GLM comparison: order judgements, bisection, few levels, unequal n, many trials, a falling curve … */
export function glmSets(): CountsSet[] {
  const sets: CountsSet[] = [
    psychometricSet('order judgements, 9 SOAs × 20', 501, range(-240, 240, 60), 20, { pse: 20, spread: 90 }),
    psychometricSet('bisection 300–900 ms × 30 (logistic truth)', 502, range(300, 900, 75), 30, { pse: 560, spread: 70, model: 'logistic' }),
    psychometricSet('four levels × 12', 503, [-100, -30, 30, 100], 12, { pse: -10, spread: 60 }),
    psychometricSet('unequal n', 504, range(-150, 150, 50), [5, 12, 30, 60, 30, 12, 5], { pse: 15, spread: 70 }),
    psychometricSet('many trials, 9 levels × 400', 505, range(-200, 200, 50), 400, { pse: -12, spread: 85 }),
    psychometricSet('falling with x', 506, range(-200, 200, 50), 25, { pse: 30, spread: -80 }),
    psychometricSet('long durations 2000–2800 ms', 507, range(2000, 2800, 100), 25, { pse: 2430, spread: 160 }),
    psychometricSet('shallow: PSE outside the tested range', 508, range(-100, 100, 25), 20, { pse: 160, spread: 200 }),
    psychometricSet('repeated levels', 509, [-90, -90, -30, -30, 0, 30, 30, 90, 90], 15, { pse: 5, spread: 45 }),
  ];
  const rnd = mulberry32(777);
  for (let i = 0; i < 6; i++) {
    const levels = 5 + Math.floor(rnd() * 8);
    const step = 20 + Math.floor(rnd() * 60);
    const x = range(-step * Math.floor(levels / 2), step * (levels - 1 - Math.floor(levels / 2)), step);
    const n = 8 + Math.floor(rnd() * 42);
    const pse = (rnd() - 0.5) * step * 2;
    const spread = step * (0.8 + 2 * rnd());
    sets.push(psychometricSet(`random ${i + 1}: ${x.length} levels × ${n}`, 600 + i, x, n, { pse, spread, model: i % 2 ? 'logistic' : 'cumulative_gaussian' }));
  }
  return sets;
}

export interface LapseSet extends CountsSet {
  model: 'cumulative_gaussian' | 'logistic';
  guess: number;
  fit_lapse: boolean;
}

export function lapseSets(): LapseSet[] {
  const withTop = (s: CountsSet, levels: number): CountsSet => ({ ...s, k: s.k.map((v, i) => (i >= s.k.length - levels ? s.n[i] : v)) });
  const x9 = range(-200, 200, 50);
  return [
    { ...psychometricSet('lapse 0.05, 9 levels × 100', 701, x9, 100, { pse: 10, spread: 60, lapse: 0.05 }), model: 'cumulative_gaussian', guess: 0, fit_lapse: true },
    { ...psychometricSet('lapse 0.04, logistic', 702, x9, 80, { pse: -20, spread: 40, lapse: 0.04, model: 'logistic' }), model: 'logistic', guess: 0, fit_lapse: true },
    { ...withTop(psychometricSet('no lapses: λ at 0', 703, x9, 40, { pse: 0, spread: 70 }), 3), model: 'cumulative_gaussian', guess: 0, fit_lapse: true },
    { ...psychometricSet('lapse 0.2: λ at 0.1', 704, x9, 60, { pse: 5, spread: 50, lapse: 0.2 }), model: 'cumulative_gaussian', guess: 0, fit_lapse: true },
    { ...psychometricSet('2AFC, guess 0.5', 705, range(20, 180, 20), 40, { pse: 90, spread: 35, guess: 0.5 }), model: 'cumulative_gaussian', guess: 0.5, fit_lapse: false },
    { ...psychometricSet('2AFC, guess 0.5, lapse 0.03, logistic', 706, range(20, 180, 20), 80, { pse: 80, spread: 20, guess: 0.5, lapse: 0.03, model: 'logistic' }), model: 'logistic', guess: 0.5, fit_lapse: true },
  ];
}

export function simultaneitySets(): CountsSet[] {
  return [
    simultaneitySet('window A 0.9, 9 SOAs × 20', 801, range(-300, 300, 75), 20, 40, 120, 0.9),
    simultaneitySet('peak below 0.5', 802, range(-300, 300, 75), 30, -20, 100, 0.4),
    simultaneitySet('A at 1', 803, range(-400, 400, 100), 40, 60, 190, 1),
    simultaneitySet('window partly outside the tested SOAs', 804, range(-150, 450, 75), 25, 60, 110, 0.85),
    simultaneitySet('many trials, 11 SOAs × 200', 805, range(-250, 250, 50), 200, 25, 90, 0.95),
    simultaneitySet('unequal n', 806, [-240, -160, -80, 0, 80, 160, 240], [10, 20, 40, 60, 40, 20, 10], -30, 80, 0.8),
  ];
}
