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

// Refusals in words and the acceptances issue 11 asks for: n = 1 with an SD, an interval not centred on its
// estimate (on the scale it was computed on), and p = 1 or F = 0 (an effect of 0).
describe('sheet refusals and acceptances', () => {
  it('n = 1 with an SD (or an SE, quartiles or an interval) is refused on every form, naming n', () => {
    const cases: [Parameters<typeof tryComputeReported>[0], Record<string, number>, string, RegExp][] = [
      ['smd', { mean1: 1, sd1: 1, n1: 1, mean2: 0, sd2: 1, n2: 5 }, 'n1', /n1 = 1 cannot come with a standard deviation \(sd1\)/],
      ['smd', { mean1: 1, se1: 1, n1: 5, mean2: 0, se2: 1, n2: 1 }, 'n2', /n2 = 1 cannot come with a standard deviation \(se2\)/],
      ['smd_paired', { mean_diff: 5, sd_diff: 3, n: 1, r: 0.5 }, 'n', /n = 1 cannot come with a standard deviation \(sd_diff\)/],
      ['smd_paired', { mean_diff: 5, sd_diff: 3, n: 1 }, 'n', /n = 1 cannot come with a standard deviation \(sd_diff\)/],
      ['smd_paired', { mean1: 5, sd1: 3, mean2: 4, sd2: 3, n: 1, r: 0.5 }, 'n', /n = 1 cannot come with a standard deviation \(sd1\)/],
      ['log_ratio', { mean1: 2, sd1: 1, n1: 5, mean2: 1, sd2: 1, n2: 1 }, 'n2', /n2 = 1 cannot come with a standard deviation/],
      ['log_ratio_paired', { mean1: 5, sd1: 3, mean2: 4, sd2: 3, n: 1, r: 0.5 }, 'n', /n = 1 cannot come with a standard deviation/],
      ['mean_diff', { mean_diff: 5, sd_diff: 3, n: 1 }, 'n', /n = 1 cannot come with a standard deviation \(sd_diff\)/],
      ['raw_mean', { mean: 250, sd: 60, n: 1 }, 'n', /n = 1 cannot come with a standard deviation \(sd\)/],
      ['raw_mean', { median: 250, lower_quartile: 200, upper_quartile: 300, n: 1 }, 'n', /n = 1 cannot come with quartiles or a range \(the SD estimated from them\)/],
      ['percent_change', { percent: 12, se: 4, n: 1 }, 'n', /n = 1 cannot come with an SE or a confidence interval/],
      ['ratio_ci', { ratio: 1.2, ci_lower: 1, ci_upper: 1.44, n: 1 }, 'n', /n = 1 cannot come with an SE or a confidence interval/],
    ];
    for (const [form, reported, field, message] of cases) {
      const a = tryComputeReported(form, reported);
      expect(a, `${form} ${JSON.stringify(reported)}`).toMatchObject({ ok: false, field });
      expect(a.error).toMatch(message);
      expect(a.error).toMatch(/an SD needs at least 2 observations|a spread needs at least 2 observations/);
    }
  });

  it('an interval not centred on its estimate is refused with both halves; one centred within rounding is accepted', () => {
    expect(tryComputeReported('mean_diff', { mean_diff: 12, ci_lower: 1, ci_upper: 30 })).toMatchObject({
      ok: false, field: 'ci_lower', error: expect.stringMatching(/not centred on mean_diff 12 \(halves 11 and 18\)/),
    });
    // a ratio's interval is centred on the log scale or on the ratio scale; 1.2 [1.1, 1.6] is on neither
    expect(tryComputeReported('ratio_ci', { ratio: 1.2, ci_lower: 1.1, ci_upper: 1.6 })).toMatchObject({
      ok: false, field: 'ci_lower', error: expect.stringMatching(/not centred on ratio 1.2 on either scale \(halves 0.087 and 0.288 on the log scale, 0.1 and 0.4 in ratio units\)/),
    });
    expect(tryComputeReported('percent_change', { percent: 12, ci_lower: 2, ci_upper: 19 })).toMatchObject({
      ok: false, field: 'ci_lower', error: expect.stringMatching(/not centred on percent 12 on either scale \(halves 0.0935 and 0.0606 on the log scale, 10 and 7 in percent\)/),
    });
    // printed to two decimals: 1.20 [0.98, 1.47] is centred on the log scale within rounding (√(0.98·1.47) = 1.2003)
    expect(computeReported('ratio_ci', { ratio: 1.2, ci_lower: 0.98, ci_upper: 1.47 }).formula).toBe('lnrom.ratio_ci.log');
    expect(computeReported('mean_diff', { mean_diff: 20.1, ci_lower: 0.4, ci_upper: 39.6 }).formula).toBe('md.ci.z');
  });

  it('p = 1 and F = 0 are accepted as an effect of 0, without a direction', () => {
    for (const reported of [{ p: 1, n1: 12, n2: 14 }, { F: 0, n1: 12, n2: 14 }, { t: 0, n1: 12, n2: 14 }]) {
      const g = computeReported('smd', reported);
      expect(g.metric).toBe('g_s');
      expect(g.effect).toBe(0);
      expect(g.variance).toBeCloseTo(1 / 12 + 1 / 14, 14);
    }
    const paired = computeReported('smd_paired', { p: 1, n: 16, r: 0.6 });
    expect(paired).toMatchObject({ metric: 'g_rm', effect: 0 });
    expect(paired.variance).toBeCloseTo((2 * (1 - 0.6)) / 16, 14);
    expect(tryComputeReported('smd', { F: 2, n1: 12, n2: 14 })).toMatchObject({ ok: false, field: 'direction' });
  });
});
