import { describe, expect, it } from 'vitest';
import { REPORT_FIELDS, tryComputeReported } from '../../../shared/extraction/compute.js';
import { inSheetWords } from '../../../src/lib/reported-labels.js';

/** What the live sheet shows for values that cannot give an effect: the engine's reason, in the sheet's labels. */
const sheetMessage = (form: keyof typeof REPORT_FIELDS, reported: Record<string, number>) => {
  const attempt = tryComputeReported(form, reported);
  expect(attempt.ok).toBe(false);
  return inSheetWords(attempt.error!, REPORT_FIELDS[form]);
};

describe('sheet calculation errors in the sheet’s own field labels', () => {
  it('names a bad value by its label, never its key', () => {
    const text = sheetMessage('smd', { mean1: 620, sd1: 80, n1: 20, mean2: 580, sd2: -5, n2: 20 });
    expect(text).toMatch(/^“SD 2” must be/);
    expect(text).not.toMatch(/\bsd2\b/);
  });

  it('says a missing set of values, and values that contradict each other, by their labels', () => {
    const needs = sheetMessage('ratio_ci', { ratio: 1.1 });
    expect(needs).toContain('“Ratio (e.g. perceived/physical duration)”, “CI lower”, “CI upper”');
    expect(needs).not.toMatch(/\bci_lower\b|\bci_upper\b/);
    const upside = sheetMessage('ratio_ci', { ratio: 1.1, ci_lower: 1.3, ci_upper: 1.0, n: 20 });
    expect(upside).toBe('“CI upper” must be greater than “CI lower”');
  });

  it('leaves words that are not fields of this form alone', () => {
    expect(inSheetWords('the reported values give no finite effect with a positive variance (log_ratio)', REPORT_FIELDS.raw_mean)).toBe(
      'the reported values give no finite effect with a positive variance (log_ratio)',
    );
    expect(inSheetWords('sd2 must be positive', REPORT_FIELDS.raw_mean)).toBe('sd2 must be positive');
    expect(inSheetWords('sd must be positive, unlike sd2', REPORT_FIELDS.raw_mean)).toBe('“SD (ms)” must be positive, unlike sd2');
  });
});
