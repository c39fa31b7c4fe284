import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import { pool, computeEffect, trimFill } from '../../../shared/stats/index.js';

const run = (command: string, input: string) =>
  spawnSync('node_modules/.bin/tsx', ['scripts/meta.ts', command], { input, encoding: 'utf8', cwd: process.cwd() });

describe('the meta CLI (npm run --silent meta -- pool|effect|trimfill)', () => {
  const input = { effects: [0.1, 0.3, 0.5, 0.9], variances: [0.01, 0.02, 0.04, 0.1], method: 'PM', hksj: true };

  it('pool prints the library result as JSON', () => {
    const res = run('pool', JSON.stringify(input));
    expect(res.status).toBe(0);
    expect(JSON.parse(res.stdout)).toEqual(JSON.parse(JSON.stringify(pool(input as never))));
  });

  it('effect prints { measure, effect, variance, formula }', () => {
    const e = { measure: 'smd', mean1: 103, sd1: 5.5, n1: 50, mean2: 100, sd2: 4.5, n2: 50 };
    const res = run('effect', JSON.stringify(e));
    expect(res.status).toBe(0);
    expect(JSON.parse(res.stdout)).toEqual(computeEffect(e));
  });

  it('trimfill prints { k0, side, estimate, se, ci_lower, ci_upper, tau2, filled }', () => {
    const res = run('trimfill', JSON.stringify({ ...input, side: 'left' }));
    expect(res.status).toBe(0);
    const out = JSON.parse(res.stdout);
    expect(Object.keys(out).sort()).toEqual(['ci_lower', 'ci_upper', 'estimate', 'filled', 'k0', 'se', 'side', 'tau2']);
    expect(out).toEqual(JSON.parse(JSON.stringify(trimFill({ ...input, side: 'left' } as never))));
  });

  it('bad input: exit status 2 and { error: { message } } on stdout', () => {
    for (const [command, body, message] of [
      ['pool', JSON.stringify({ effects: [1, 2], variances: [1, 0] }), /variances\[1\]/],
      ['pool', '{not json', /not valid JSON/],
      ['effect', JSON.stringify({ measure: 'fisher_z', r: 3, n: 10 }), /r must be a correlation/],
      ['nonsense', '{}', /usage/],
    ] as const) {
      const res = run(command, body);
      expect(res.status).toBe(2);
      const out = JSON.parse(res.stdout);
      expect(Object.keys(out)).toEqual(['error']);
      expect(out.error.message).toMatch(message);
    }
  });
});
