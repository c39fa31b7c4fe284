// The fitted curves drawn over the observed proportions (shared/plots/psychometric.ts) against statsmodels'
// GLM predictions (Debian python3-statsmodels) on invented seeded sets: the curve is the model that was fitted.
import { describe, expect, it } from 'vitest';
import { fitPsychometric, fitSimultaneity } from '../../shared/psychophysics/index.js';
import { fittedProbability, proportionsFigure } from '../../shared/plots/psychometric.js';
import { inventTrials, ORDER_SOAS, SJ_SOAS } from '../support/trials.js';
import { relErr, runReference } from './python-reference.js';

function countsOf(lines: ReturnType<typeof inventTrials>, participant: string, condition: string) {
  const x = [...new Set(lines.map((l) => l.level))].sort((a, b) => a - b);
  const mine = lines.filter((l) => l.participant === participant && l.condition === condition);
  const n = x.map((v) => mine.filter((l) => l.level === v).length);
  const k = x.map((v) => mine.filter((l) => l.level === v && l.response === 1).length);
  return { x, n, k };
}

const order = inventTrials({ task: 'order', participants: 4, conditions: { near: 0, far: 60 }, levels: ORDER_SOAS, trialsPerLevel: 16, seed: 7101 });
const sets = ['P01', 'P02', 'P03', 'P04'].flatMap((p) => ['near', 'far'].map((c) => countsOf(order, p, c)));
const grid = Array.from({ length: 41 }, (_, i) => -300 + 15 * i);
const reference = runReference<{ statsmodels: string; sets: { probit: number[]; logit: number[] }[] }>('fitted_curve_reference.py', { sets: sets.map((s) => ({ ...s, grid })) });

describe(`fitted psychometric curves against statsmodels ${reference.statsmodels} GLM predictions`, () => {
  it('match the probit and logit predictions on a grid beyond the tested levels within 1e-8', () => {
    let worst = 0;
    sets.forEach((s, i) => {
      for (const [model, expected] of [['cumulative_gaussian', reference.sets[i].probit], ['logistic', reference.sets[i].logit]] as const) {
        const fit = fitPsychometric({ ...s, model });
        expect(fit.converged).toBe(true);
        grid.forEach((x, j) => (worst = Math.max(worst, relErr(fittedProbability(fit, x)!, expected[j], 1e-12))));
      }
    });
    expect(worst).toBeLessThan(1e-8);
  });
});

describe('the proportions figure', () => {
  it('draws k/n per level and a curve per condition that passes 0.5 at the PSE, and none for a failed fit', () => {
    const near = sets[0];
    const far = sets[1];
    const fits = [fitPsychometric({ ...near, model: 'cumulative_gaussian' }), fitPsychometric({ ...far, model: 'cumulative_gaussian' })];
    expect(fittedProbability(fits[0], fits[0].pse!)).toBeCloseTo(0.5, 12);
    const failed = fitPsychometric({ x: [-50, 50], n: [10, 10], k: [10, 10], model: 'logistic' });
    expect(failed.converged).toBe(false);
    const fig = proportionsFigure({
      title: 'P01',
      responseLabel: 'proportion "second first"',
      cells: [{ condition: 'near', ...near, fit: fits[0] }, { condition: 'far', ...far, fit: fits[1] }, { condition: 'odd', x: [-50, 50], n: [10, 10], k: [10, 10], fit: failed }],
    });
    const observed = fig.data.filter((t) => String(t.meta).startsWith('observed'));
    const curves = fig.data.filter((t) => String(t.meta).startsWith('fitted'));
    expect(observed).toHaveLength(3);
    expect(curves).toHaveLength(2);
    expect(observed[0].y).toEqual(near.k.map((k, j) => k / near.n[j]));
    expect(curves[0].line).not.toEqual(curves[1].line);
  });

  it('draws a simultaneity window as A·exp(−(x − μ)²/(2σ²)), 0.5 at the window edges', () => {
    const sj = inventTrials({ task: 'simultaneity', participants: 1, conditions: { base: 0 }, levels: SJ_SOAS, trialsPerLevel: 30, seed: 7102 });
    const fit = fitSimultaneity(countsOf(sj, 'P01', 'base'));
    expect(fit.converged && fit.width !== null).toBe(true);
    const half = fit.width! / 2;
    expect(fittedProbability(fit, fit.centre! - half)).toBeCloseTo(0.5, 10);
    expect(fittedProbability(fit, fit.centre! + half)).toBeCloseTo(0.5, 10);
    expect(fittedProbability(fit, fit.centre!)).toBeCloseTo(fit.amplitude!, 12);
  });
});
