import { describe, expect, it } from 'vitest';
import { computeReported, tryComputeReported, REPORT_FIELDS, METRICS_OF_FORM } from '../../../shared/extraction/compute.js';
import { effectWarnings } from '../../../shared/extraction/warnings.js';
import { effectDraftSchema } from '../../../shared/schemas/extraction.js';
import { effectQuantity } from '../../../shared/vocabulary/parameters.js';
import { metricAllowed } from '../../../shared/vocabulary/outcomes.js';

// The sheet's forms for a ratio or percent change with its CI and for 2×2 counts (issue 11); the values
// themselves are checked against metafor in tests/reference/sheet-forms.test.ts.
describe('sheet forms: ratio CI, percent-change CI, 2×2 counts', () => {
  it('a ratio with its CI is a log ratio with the SE from the interval on the scale it is centred on', () => {
    // 1.2 [1.0, 1.44]: √(1.0·1.44) = 1.2, so centred on the log scale: SE = ln(1.44)/(2·1.959964)
    const log = computeReported('ratio_ci', { ratio: 1.2, ci_lower: 1.0, ci_upper: 1.44, n: 24 });
    expect(log).toMatchObject({ metric: 'log_ratio', formula: 'lnrom.ratio_ci.log', n: 24 });
    expect(log.effect).toBeCloseTo(Math.log(1.2), 14);
    expect(Math.sqrt(log.variance)).toBeCloseTo(Math.log(1.44) / (2 * 1.959963984540054), 12);
    // 1.2 [1.1, 1.3]: centred on the ratio scale: SE = 0.2/(2z)/1.2 (delta method)
    const lin = computeReported('ratio_ci', { ratio: 1.2, ci_lower: 1.1, ci_upper: 1.3 });
    expect(lin.formula).toBe('lnrom.ratio_ci.linear');
    expect(Math.sqrt(lin.variance)).toBeCloseTo(0.2 / (2 * 1.959963984540054) / 1.2, 12);
  });

  it('a percent change takes its CI or its SE', () => {
    const ci = computeReported('percent_change', { percent: 12, ci_lower: 5, ci_upper: 19 });
    expect(ci).toMatchObject({ metric: 'log_ratio', formula: 'lnrom.percent_ci.linear' });
    expect(ci.variance).toBeCloseTo((14 / (2 * 1.959963984540054) / 100) ** 2 / 1.12 ** 2, 14);
    expect(computeReported('percent_change', { percent: 12, se: 4 })).toMatchObject({ formula: 'lnrom.percent', variance: 0.04 ** 2 / 1.12 ** 2 });
  });

  it('2×2 counts give a log odds ratio (or g_s through it, Chinn 2000) and their total as n', () => {
    const counts = { events1: 31, nonevents1: 9, events2: 18, nonevents2: 22 };
    const lor = computeReported('counts_2x2', counts);
    expect(lor).toMatchObject({ metric: 'log_odds_ratio', formula: 'lnor.counts', n: 80 });
    expect(lor.variance).toBeCloseTo(1 / 31 + 1 / 9 + 1 / 18 + 1 / 22, 14);
    const g = computeReported('counts_smd', counts);
    expect(g.metric).toBe('g_s');
    expect(g.effect).toBeCloseTo((lor.effect * Math.sqrt(3)) / Math.PI, 14);
    expect(computeReported('counts_2x2', { ...counts, events1: 0 }).formula).toBe('lnor.counts.corrected');
  });

  it('an incomplete form names only its own fields', () => {
    expect(tryComputeReported('ratio_ci', { ratio: 1.2, ci_lower: 1 })).toMatchObject({ ok: false, error: 'this form needs ratio, ci_lower, ci_upper' });
    expect(tryComputeReported('percent_change', { percent: 12 }).error).toBe('this form needs percent, ci_lower, ci_upper; or percent, se');
    expect(tryComputeReported('counts_2x2', { events1: 3, nonevents1: 4 }).error).toBe('this form needs events1, nonevents1, events2, nonevents2');
    expect(tryComputeReported('counts_2x2', { events1: 3.5, nonevents1: 4, events2: 1, nonevents2: 2 })).toMatchObject({ field: 'events1', error: 'events1 must be a whole number of at least 0' });
  });

  it('the forms are on the sheet: their fields parse, the counts record the odds of a response, and where they pool', () => {
    expect(REPORT_FIELDS.counts_2x2).toEqual(['events1', 'nonevents1', 'events2', 'nonevents2']);
    const e = effectDraftSchema.parse({ form: 'ratio_ci', outcome: 'duration_distortion', reported: { ratio: '1.2', ci_lower: '1', ci_upper: '1.44' } });
    expect(e.reported).toMatchObject({ ratio: 1.2, ci_lower: 1, ci_upper: 1.44 });
    expect(effectQuantity({ outcome: 'duration_distortion', form: 'counts_2x2' })).toEqual({ parameter: 'response_odds', unit: 'none' });
    expect(effectQuantity({ outcome: 'temporal_order', form: 'counts_smd' })).toEqual({ parameter: 'response_odds', unit: 'none' });
    expect(effectQuantity({ outcome: 'duration_distortion', form: 'ratio_ci' })).toEqual({ parameter: 'duration_ratio', unit: 'ratio' });
    expect(METRICS_OF_FORM.counts_2x2).toEqual(['log_odds_ratio']);
    expect(metricAllowed('duration_distortion', 'log_odds_ratio')).toBe(true);
    expect(metricAllowed('simultaneity_window', 'log_odds_ratio')).toBe(false);
    const within = effectWarnings({ label: '', reported: {}, form: 'counts_2x2' }, { label: '', design: 'within', effects: [] }, null);
    expect(within.map((w) => w.field)).toContain('form');
  });
});
