import { describe, expect, it } from 'vitest';
import { FairQueue } from '../../../server/lib/fair-queue.js';

const tick = () => new Promise((r) => setTimeout(r, 1));

describe('FairQueue', () => {
  it('runs one task at a time and gives callers turns, so a flood delays only its sender', async () => {
    const q = new FairQueue(1);
    const order: string[] = [];
    let running = 0;
    let most = 0;
    const task = (name: string) => async () => {
      running++;
      most = Math.max(most, running);
      await tick();
      order.push(name);
      running--;
      return name;
    };
    const flood = Array.from({ length: 5 }, (_, i) => q.run('flooder', task(`f${i}`)));
    expect(q.waiting('flooder')).toBe(4);
    const other = [q.run('reader', task('r0')), q.run('reader', task('r1')), q.run('third', task('t0'))];
    expect(await Promise.all([...flood, ...other])).toEqual(['f0', 'f1', 'f2', 'f3', 'f4', 'r0', 'r1', 't0']);
    expect(most).toBe(1);
    // f0 was running; then each caller in turn
    expect(order).toEqual(['f0', 'f1', 'r0', 't0', 'f2', 'r1', 'f3', 'f4']);
  });

  it('passes a failure to its caller and goes on with the next task', async () => {
    const q = new FairQueue(2);
    const failed = q.run('a', async () => {
      throw new Error('no');
    });
    await expect(failed).rejects.toThrow('no');
    expect(await q.run('a', async () => 7)).toBe(7);
  });
});
