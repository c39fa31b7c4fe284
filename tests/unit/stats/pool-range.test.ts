import { describe, expect, it } from 'vitest';
import { pool, StatsInputError, StatsRangeError } from '../../../shared/stats/index.js';
import { METHODS } from '../../../shared/stats/types.js';

// Values every input check accepts but whose arithmetic leaves double precision: the engine says so instead of
// answering NaN or crashing (IEEE 754: 1e308² = ∞, 1/1e-320 = ∞).
describe('pool: non-finite intermediate results', () => {
  const extreme = [
    { effects: [1e308, -1e308], variances: [1, 1] },
    { effects: [0.2, 0.4], variances: [1e-320, 1] },
    { effects: [1e308, -1e308], variances: [1e-320, 1] },
    { effects: [1e308], variances: [1e-320] },
  ];
  for (const method of METHODS) {
    it(`throws StatsRangeError (a StatsInputError) with ${method}`, () => {
      for (const input of extreme) {
        let err: unknown;
        try {
          pool({ ...input, method });
        } catch (e) {
          err = e;
        }
        expect(err, JSON.stringify(input)).toBeInstanceOf(StatsRangeError);
        expect(err).toBeInstanceOf(StatsInputError);
        expect((err as Error).message).toMatch(/is not a finite number/);
      }
    });
  }

  it('still pools large but representable values', () => {
    const r = pool({ effects: [1e150, 3e150], variances: [1, 1], method: 'FE' });
    expect(r.estimate).toBeCloseTo(2e150, -140);
  });
});
