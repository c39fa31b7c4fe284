import { describe, expect, it } from 'vitest';
import { computeReported } from '../../../shared/extraction/compute.js';
import { orientComputed } from '../../../shared/extraction/orientation.js';
import { signReversal } from '../../../shared/vocabulary/parameters.js';

const shift = computeReported('mean_diff', { mean_diff: -30, sd_diff: 60, n: 20 });

describe('the sheet keeps duration distortion’s sign convention', () => {
  it('reverses a lower PSE in bisection or two-interval comparison, and a bisection point in any task, with the reason', () => {
    for (const [parameter, task] of [['pse', 'bisection'], ['pse', 'two_interval_comparison'], ['bisection_point', 'reproduction']] as const) {
      const o = orientComputed(shift, { outcome: 'duration_distortion', parameter }, task);
      expect(o).toMatchObject({ effect: 30, variance: shift.variance, signReversed: true });
      expect(o.signReason).toMatch(/a lower value means the manipulation lengthened perceived duration \(positive = the manipulation lengthens perceived duration\)/);
    }
  });

  it('keeps the sign of a perceived-duration ratio, a PSE in reproduction, other outcome kinds, a raw mean, and an effect without a task', () => {
    expect(orientComputed(shift, { outcome: 'duration_distortion' }, 'bisection')).toMatchObject({ effect: -30, signReversed: false });
    expect(orientComputed(shift, { outcome: 'duration_distortion', parameter: 'pse' }, 'reproduction').signReversed).toBe(false);
    expect(orientComputed(shift, { outcome: 'temporal_order', parameter: 'pss' }, 'bisection').signReversed).toBe(false);
    expect(orientComputed(shift, { outcome: 'duration_distortion', parameter: 'pse' }, undefined).signReversed).toBe(false);
    const level = computeReported('raw_mean', { mean: 250, sd: 60, n: 20 });
    expect(orientComputed(level, { outcome: 'duration_distortion', parameter: 'pse' }, 'bisection')).toMatchObject({ effect: level.effect, signReversed: false });
    expect(signReversal({ outcome: 'duration_distortion', parameter: 'weber_fraction' }, 'bisection')).toBeNull();
  });
});
