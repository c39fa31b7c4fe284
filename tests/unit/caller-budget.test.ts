import { describe, expect, it } from 'vitest';
import { CallerBudget } from '../../server/lib/caller-budget.js';

describe('CallerBudget (one budget per caller, refilled evenly over a minute)', () => {
  const clock = () => {
    let t = 1_000_000;
    return { now: () => t, advance: (ms: number) => (t += ms) };
  };

  it('spends what a caller holds, refuses without spending, and says how long to wait', () => {
    const c = clock();
    const b = new CallerBudget(60, c.now); // one unit a second
    expect(b.spend('a', 50)).toEqual({ ok: true, left: 10 });
    const refused = b.spend('a', 15);
    expect(refused).toEqual({ ok: false, cost: 15, left: 10, retryAfterS: 5 });
    expect(b.balance('a')).toBe(10); // the refusal spent nothing
    c.advance(5_000);
    expect(b.spend('a', 15)).toEqual({ ok: true, left: 0 });
  });

  it('keeps callers apart and never holds more than a minute of budget', () => {
    const c = clock();
    const b = new CallerBudget(60, c.now);
    b.spend('a', 60);
    expect(b.spend('a', 1).ok).toBe(false);
    expect(b.spend('b', 60).ok).toBe(true);
    c.advance(10 * 60_000);
    expect(b.balance('a')).toBe(60);
  });

  it('caps a cost at a minute of budget, so a large request is paid once the budget is full', () => {
    const c = clock();
    const b = new CallerBudget(60, c.now);
    b.spend('a', 30);
    const refused = b.spend('a', 500);
    expect(refused.ok).toBe(false);
    if (!refused.ok) expect(refused.retryAfterS).toBe(30);
    c.advance(30_000);
    expect(b.spend('a', 500)).toEqual({ ok: true, left: 0 });
  });
});
