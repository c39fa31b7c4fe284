import { describe, expect, it } from 'vitest';
import { pool, leaveOneOut, cumulative, type Method } from '../../../shared/stats/index.js';
import { randomDataSet } from '../../reference/seeded-data.js';

const FIELDS = ['estimate', 'se', 'ci_lower', 'ci_upper', 'tau2', 'I2', 'Q'] as const;

function compare(entry: Record<string, unknown>, ref: Record<string, unknown>, tol: number) {
  for (const f of FIELDS) {
    const a = entry[f] as number | null;
    const b = ref[f] as number | null;
    if (b === null) expect(a, f).toBeNull();
    else expect(Math.abs((a as number) - b), `${f}: ${a} vs ${b}`).toBeLessThanOrEqual(tol * Math.max(Math.abs(b), 1e-300));
  }
}

const sets = [
  randomDataSet('k=6', 1, 6, 0.3, 0.05, 0.01, 0.2),
  randomDataSet('k=40', 2, 40, -0.4, 0.2, 0.02, 0.3),
  randomDataSet('k=300', 3, 300, 0.1, 0.01, 0.005, 0.05),
];
// one study far out: its removal moves DL's tau² beyond the series' range and takes the direct path
const outlier = randomDataSet('outlier', 4, 30, 0.2, 0.001, 0.01, 0.02);
outlier.effects[7] = 6;
outlier.variances[7] = 0.001;
sets.push(outlier);

describe('leave-one-out and cumulative equal refits with pool()', () => {
  for (const set of sets) {
    for (const method of ['FE', 'DL', 'REML', 'PM'] as Method[]) {
      for (const hksj of [false, true]) {
        it(`${set.name} ${method}${hksj ? ' + HKSJ' : ''}`, () => {
          const input = { effects: set.effects, variances: set.variances, method, hksj };
          const loo = leaveOneOut(input);
          const cum = cumulative(input);
          const k = set.effects.length;
          expect(loo).toHaveLength(k);
          expect(cum).toHaveLength(k);
          const picks = [...new Set([0, 1, 2, 7, Math.floor(k / 2), k - 2, k - 1])].filter((i) => i < k);
          for (const i of picks) {
            const r = pool({ ...input, effects: set.effects.filter((_, j) => j !== i), variances: set.variances.filter((_, j) => j !== i) });
            expect(loo[i].index).toBe(i);
            expect(loo[i].k).toBe(k - 1);
            compare(loo[i] as never, r as never, 1e-9);
            const c = pool({ ...input, effects: set.effects.slice(0, i + 1), variances: set.variances.slice(0, i + 1) });
            expect(cum[i].k).toBe(i + 1);
            compare(cum[i] as never, c as never, 1e-9);
          }
        });
      }
    }
  }

  it('cumulative entry 0 is the first study alone, heterogeneity null', () => {
    const c = cumulative({ effects: [0.5, 0.1], variances: [0.04, 0.01] })[0];
    expect(c.estimate).toBe(0.5);
    expect(c.se).toBeCloseTo(0.2, 15);
    expect([c.tau2, c.I2, c.Q]).toEqual([null, null, null]);
  });

  it('leave-one-out needs two effects', () => {
    expect(() => leaveOneOut({ effects: [1], variances: [1] })).toThrow(/at least 2/);
  });
});
