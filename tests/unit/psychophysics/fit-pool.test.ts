import { afterAll, describe, expect, it } from 'vitest';
import { bootstrapFit } from '../../../shared/psychophysics/index.js';
import { createFitPool, type BootstrapTask } from '../../../server/psychophysics/fit-pool.js';

const x = [-200, -150, -100, -50, 0, 50, 100, 150, 200];
const n = x.map(() => 20);
const tasks: BootstrapTask[] = [
  { input: { x, n, k: [1, 2, 4, 7, 9, 13, 16, 18, 20], model: 'cumulative_gaussian' }, options: { resamples: 60, seed: 1 } },
  { input: { x, n, k: [0, 1, 3, 8, 11, 14, 17, 19, 20], model: 'logistic' }, options: { resamples: 60, seed: 2 } },
  { input: { x, n, k: [0, 0, 1, 3, 10, 17, 18, 18, 19], model: 'logistic', lapse: true }, options: { resamples: 40, seed: 3 } },
  { input: { x, n, k: [1, 3, 10, 15, 18, 17, 16, 8, 2] }, options: { resamples: 40, seed: 4 } },
  { input: { x, n, k: [2, 3, 5, 6, 10, 12, 15, 19, 19], model: 'cumulative_gaussian' }, options: { resamples: 60, seed: 5 } },
];

describe('fit pool (worker threads)', () => {
  const pool = createFitPool({ size: 2, batchSize: 1 });
  afterAll(() => pool.close());

  it('returns, in task order, exactly what bootstrapFit gives on this thread, and reports progress', async () => {
    const progress: number[] = [];
    const results = await pool.run(tasks, (done, total) => {
      expect(total).toBe(tasks.length);
      progress.push(done);
    });
    expect(results.map((r) => r.kind)).toEqual(['psychometric', 'psychometric', 'psychometric', 'simultaneity', 'psychometric']);
    for (const [i, t] of tasks.entries()) expect(results[i]).toEqual(bootstrapFit(t.input, t.options));
    expect(progress.at(-1)).toBe(tasks.length);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));
  });

  it('a bad task rejects the run with the engine message, and the pool keeps working', async () => {
    await expect(pool.run([tasks[0], { input: { x, n, k: n.map(() => 25), model: 'logistic' } }])).rejects.toThrow(/PsychophysicsInputError: k\[0\] must be a whole count/);
    const again = await pool.run([tasks[1]]);
    expect(again[0]).toEqual(bootstrapFit(tasks[1].input, tasks[1].options));
  });
});
