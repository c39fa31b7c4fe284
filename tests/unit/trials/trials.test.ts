import { describe, expect, it } from 'vitest';
import { pairedSummary } from '../../../shared/stats/paired-summary.js';
import { deriveContrast } from '../../../shared/trials/contrast.js';
import { countsByCell, parseTrialsCsv } from '../../../shared/trials/csv.js';
import { flagFit, type CellFit } from '../../../shared/trials/fits.js';
import { fitPsychometric, fitSimultaneity } from '../../../shared/psychophysics/index.js';

describe('parseTrialsCsv', () => {
  it('reads trials and counts by their header, and names each bad row in words', () => {
    const t = parseTrialsCsv('Participant,Condition,Level,Response\nP1,a,-60,0\nP1,a,60,1\n');
    expect(t.format).toBe('trials');
    expect(t.rows).toEqual([
      { line: 2, participant: 'P1', condition: 'a', level: -60, n: 1, k: 0 },
      { line: 3, participant: 'P1', condition: 'a', level: 60, n: 1, k: 1 },
    ]);
    const c = parseTrialsCsv('participant,condition,level,n,k\nP1,a,0,10,11\nP1,a,x,0,2.5\n');
    expect(c.format).toBe('counts');
    expect(c.errors).toEqual([
      { line: 2, message: 'k (11) cannot be more than n (10)' },
      { line: 3, message: 'level must be a number of ms (got "x"); n must be a whole number of trials of at least 1 (got "0"); k must be a whole count of at least 0 (got "2.5")' },
    ]);
    expect(parseTrialsCsv('participant,condition,level,response,rt\nP1,a,0,1,300\n').errors[0]).toEqual({ line: 1, message: 'unknown column rt: only participant, condition, level, response are read' });
    expect(parseTrialsCsv('participant,condition,level,response\nP1,a,0\n').errors[0].line).toBe(2);
    expect(parseTrialsCsv('').errors[0].message).toMatch(/empty/);
    expect(parseTrialsCsv('participant,condition,level,response\n').errors[0].message).toMatch(/no rows/);
    expect(parseTrialsCsv('participant,condition,level,response\nP,a,0,1\nP,a,1,1\nP,a,2,0\n', 2).errors[0].message).toMatch(/at most 2/);
  });

  it('sums rows per participant × condition × level', () => {
    const { rows } = parseTrialsCsv('participant,condition,level,response\nP1,a,60,1\nP1,a,-60,0\nP1,a,60,0\nP2,a,60,1\n');
    expect(countsByCell(rows)).toEqual([
      { participant: 'P1', condition: 'a', x: [-60, 60], n: [1, 2], k: [0, 1] },
      { participant: 'P2', condition: 'a', x: [60], n: [1], k: [1] },
    ]);
  });
});

describe('pairedSummary', () => {
  it('matches numpy (mean, std ddof=1, corrcoef) on a small example', () => {
    // numpy 1.24: a=[1,2,3,4], b=[1,3,2,5]; d.mean() −0.25, d.std(ddof=1) 0.9574271077563381, corrcoef 0.8315218406202999
    const s = pairedSummary([1, 2, 3, 4], [1, 3, 2, 5]);
    expect(s.mean_diff).toBeCloseTo(-0.25, 14);
    expect(s.sd_diff).toBeCloseTo(0.9574271077563381, 14);
    expect(s.r!).toBeCloseTo(0.8315218406202999, 14);
    // S_diff² = S1² + S2² − 2 r S1 S2 (Borenstein et al. 2009, ch. 4)
    expect(s.sd_diff ** 2).toBeCloseTo(s.sd1 ** 2 + s.sd2 ** 2 - 2 * s.r! * s.sd1 * s.sd2, 12);
    expect(pairedSummary([1, 1], [2, 3]).r).toBeNull();
    expect(() => pairedSummary([1], [2])).toThrow(/at least 2/);
  });
});

describe('flagFit', () => {
  it('flags a PSE outside the tested range, no convergence, and implausible windows as common practice', () => {
    const x = [-100, -50, 0, 50, 100];
    const off = fitPsychometric({ x, n: [20, 20, 20, 20, 20], k: [0, 1, 2, 4, 8], model: 'cumulative_gaussian' });
    expect(off.pse!).toBeGreaterThan(100);
    expect(flagFit(off, x, false).map((f) => f.code)).toEqual(['outside_range']);
    const sep = fitPsychometric({ x, n: [20, 20, 20, 20, 20], k: [0, 0, 0, 20, 20], model: 'cumulative_gaussian' });
    expect(flagFit(sep, x, false)).toEqual([expect.objectContaining({ code: 'not_converged', commonPractice: false })]);
    const sx = [-600, -400, -200, 0, 200, 400, 600];
    const wide = fitSimultaneity({ x: sx, n: sx.map(() => 20), k: [8, 16, 19, 19, 19, 16, 8] });
    expect(wide.width!).toBeGreaterThan(500);
    const flags = flagFit(wide, sx, true);
    expect(flags.map((f) => f.code)).toEqual(['wide_window', 'audiovisual_band']);
    expect(flags.every((f) => f.commonPractice)).toBe(true);
    const nx = [-40, -20, -10, 0, 10, 20, 40];
    const narrow = fitSimultaneity({ x: nx, n: nx.map(() => 20), k: [0, 1, 6, 19, 6, 1, 0] });
    expect(flagFit(narrow, nx, false).map((f) => f.code)).toEqual(['narrow_window']);
  });
});

describe('deriveContrast', () => {
  const cell = (participant: string, condition: string, pse: number | null, jnd = 60): CellFit => ({
    participant, condition, kind: 'psychometric', x: [], n: [], k: [], ci: {}, resamples: 0, failed: 0, flags: [],
    fit: { model: 'cumulative_gaussian', pse, se_pse: null, spread: null, se_spread: null, jnd: pse === null ? null : jnd, lapse: 0, deviance: 0, df: 0, loglik: 0, converged: pse !== null, iterations: 0 },
  });
  it('pairs participants with both values and says who was left out and why', () => {
    const fits = [cell('P1', 'a', 30), cell('P1', 'b', 10), cell('P2', 'a', 50), cell('P2', 'b', 20), cell('P3', 'a', 40), cell('P3', 'b', null), cell('P4', 'a', 5), cell('P5', 'a', 20), cell('P5', 'b', 5)];
    const c = deriveContrast(fits, { parameter: 'pse', conditionA: 'a', conditionB: 'b', measure: 'mean_diff' });
    const s = pairedSummary([30, 50, 20], [10, 20, 5]);
    expect(c.summary).toEqual(s);
    expect(c.reported).toEqual({ mean_diff: s.mean_diff, sd_diff: s.sd_diff, n: 3 });
    expect(c.computed.variance).toBeCloseTo(s.sd_diff ** 2 / 3, 12);
    expect(c.excluded.map((e) => e.participant)).toEqual(['P3', 'P4']);
    expect(c.excluded[1].reason).toBe('no trials in condition b');
    expect(() => deriveContrast(fits.slice(0, 2), { parameter: 'pse', conditionA: 'a', conditionB: 'b', measure: 'mean_diff' })).toThrow(/at least 2/);
    expect(() => deriveContrast(fits, { parameter: 'pse', conditionA: 'a', conditionB: 'b', measure: 'log_ratio' })).toThrow(/JND and the window width/);
  });
});
