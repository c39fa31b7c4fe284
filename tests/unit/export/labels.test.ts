import { describe, expect, it } from 'vitest';
import { LABELS, labelOf, metricDigits } from '../../../shared/vocabulary/labels.js';
import { valueLabel } from '../../../shared/synthesis/labels.js';
import { metricDigits as plotDigits } from '../../../shared/plots/theme.js';
import { digitsFor } from '../../../src/lib/format.js';
import { defaultTitle } from '../../../server/services/snapshots.js';
import { MODERATOR_LABELS, REGRESSION_MODERATORS, synthesisRequestSchema } from '../../../shared/schemas/synthesis.js';
import { METRICS } from '../../../shared/stats/metrics.js';

describe('the one label table', () => {
  it('has a word for every code of every kind, never a key with underscores', () => {
    for (const [kind, table] of Object.entries(LABELS))
      for (const [code, label] of Object.entries(table as Record<string, string>)) {
        expect(label, `${kind}.${code}`).not.toMatch(/_/);
        expect(label.trim().length, `${kind}.${code}`).toBeGreaterThan(0);
      }
    for (const m of METRICS) expect(labelOf('metric', m)).not.toBe(m);
    expect(LABELS.moderator).toMatchObject(MODERATOR_LABELS);
    expect(Object.keys(LABELS.moderator).sort()).toEqual([...REGRESSION_MODERATORS].sort());
  });

  it('answers screens and exports alike, SMD families included, and never shows a raw key', () => {
    expect(labelOf('outcome', 'duration_distortion')).toBe('Duration distortion');
    expect(labelOf('population', 'healthy_adults')).toBe(LABELS.population.healthy_adults);
    expect(labelOf('metric', 'smd_raw_score')).toMatch(/raw-score standardized mean difference/);
    expect(valueLabel('metric', 'smd_raw_score')).toBe(labelOf('metric', 'smd_raw_score'));
    expect(labelOf('screening', 'unscreened')).toBe('Not yet screened');
    expect(labelOf('manipulation', 'looming_receding')).toBe('Looming vs receding');
    expect(labelOf('manipulation', 'a_term_added_later')).toBe('a term added later');
  });

  it('one digits rule: ms metrics to 1 decimal, standardized to 3 in tables and 2 on plots', () => {
    expect([metricDigits('mean_diff'), metricDigits('raw_mean'), metricDigits('g_s'), metricDigits('log_ratio')]).toEqual([1, 1, 3, 3]);
    for (const m of [...METRICS, 'smd_raw_score']) {
      expect(digitsFor(m)).toBe(metricDigits(m, 'table'));
      expect(plotDigits(m)).toBe(metricDigits(m, 'plot'));
    }
  });

  it("a snapshot's default title names its filters in words", () => {
    const request = synthesisRequestSchema.parse({ filters: { manipulation: ['looming_receding', 'speed_motion'], outcome: 'duration_distortion', population: 'healthy_adults', task: 'verbal_estimation' } });
    const title = defaultTitle(request, 'g_s');
    expect(title.split(' — ')[0]).not.toMatch(/_/); // g_s is the metric's published name
    expect(title).toBe(`Looming vs receding + Speed / motion, Duration distortion, ${LABELS.population.healthy_adults}, ${labelOf('task', 'verbal_estimation')} — Hedges' g_s (independent groups), DerSimonian–Laird`);
  });
});
