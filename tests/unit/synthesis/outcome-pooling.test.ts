import { describe, expect, it } from 'vitest';
import { synthesisRequestSchema } from '../../../shared/schemas/synthesis.js';
import { MixedOutcomesError, pooledMetric } from '../../../shared/synthesis/metric-choice.js';
import type { SettledEffect } from '../../../shared/synthesis/types.js';

let id = 0;
const effect = (outcome: string, metric: string, parameter = 'pss', unit = 'ms'): SettledEffect => {
  id += 1;
  return { id, referenceId: id, studyId: id, studyLabel: 'Experiment 1', referenceLabel: `Paper ${id}`, year: 2010, outcome, parameter, unit, manipulation: 'expectation', metric, effect: 0.3, variance: 0.05, n: 20, design: 'within', population: null, modality: null, task: null, standardMs: null };
};

const refusal = (effects: SettledEffect[], request: object): MixedOutcomesError => {
  try {
    pooledMetric(effects, synthesisRequestSchema.parse(request));
  } catch (err) {
    if (err instanceof MixedOutcomesError) return err;
    throw err;
  }
  throw new Error('pooled');
};

describe('one outcome kind per synthesis', () => {
  it('refuses effects of two outcome kinds even when parameter, unit and metric agree', () => {
    const err = refusal([effect('temporal_order', 'mean_diff'), effect('temporal_order', 'mean_diff'), effect('recalibration_shift', 'mean_diff')], {});
    expect(err.outcomes).toEqual([
      { outcome: 'temporal_order', label: 'Temporal order', count: 2 },
      { outcome: 'recalibration_shift', label: 'Recalibration shift', count: 1 },
    ]);
    expect(err.choices.map((c) => c.request.filters)).toEqual([
      { outcome: 'temporal_order', parameter: 'pss', unit: 'ms', metric: 'mean_diff' },
      { outcome: 'recalibration_shift', parameter: 'pss', unit: 'ms', metric: 'mean_diff' },
    ]);
    // each choice pools as it stands
    for (const c of err.choices) {
      const f = c.request.filters;
      const subset = [effect('temporal_order', 'mean_diff'), effect('recalibration_shift', 'mean_diff')].filter((e) => e.outcome === f.outcome);
      expect(pooledMetric(subset, c.request).metric).toBe('mean_diff');
    }
  });

  it('under "smdFamily": "raw_score" the family counts as one metric: one choice per outcome kind keeps the family', () => {
    const err = refusal([effect('temporal_order', 'g_s'), effect('temporal_order', 'g_av'), effect('recalibration_shift', 'g_rm')], { smdFamily: 'raw_score' });
    expect(err.choices.map((c) => [c.effects, c.request.smdFamily, c.request.filters])).toEqual([
      [2, 'raw_score', { outcome: 'temporal_order', parameter: 'pss', unit: 'ms' }],
      [1, 'raw_score', { outcome: 'recalibration_shift', parameter: 'pss', unit: 'ms' }],
    ]);
    expect(err.choices[0].label).toMatch(/^Only Temporal order · PSS \(ms\) · raw-score standardized mean difference/);
  });

  it('one outcome kind passes on to the metric and quantity checks', () => {
    expect(pooledMetric([effect('temporal_order', 'mean_diff'), effect('temporal_order', 'mean_diff')], synthesisRequestSchema.parse({})).metric).toBe('mean_diff');
  });
});
