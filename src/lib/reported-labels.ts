import type { ReportedKey } from '../../shared/extraction/compute';

/** Field labels of the sheet's reported statistics. */
export const REPORTED_LABELS: Record<ReportedKey, string> = {
  mean1: 'Mean 1 (condition/group 1)',
  sd1: 'SD 1',
  n1: 'n 1',
  mean2: 'Mean 2 (condition/group 2)',
  sd2: 'SD 2',
  n2: 'n 2',
  t: 't',
  F: 'F(1, df)',
  p: 'p (two-tailed)',
  direction: 'Direction (1: group 1 higher, −1: lower)',
  mean_diff: 'Mean difference',
  sd_diff: 'SD of the differences',
  n: 'n (participants)',
  r: 'r (reported correlation)',
  ci_lower: 'CI lower',
  ci_upper: 'CI upper',
  level: 'CI level (e.g. 0.95)',
  df: 'df (for a t-based CI)',
  mean: 'Mean (ms)',
  sd: 'SD (ms)',
  percent: 'Percent change (e.g. 12 for +12%)',
  se: 'SE (of the mean or percent change)',
  p_less_than: 'p below (a bound, e.g. 0.001)',
  se1: 'SE 1 (instead of SD 1)',
  se2: 'SE 2 (instead of SD 2)',
  median1: 'Median 1',
  lower_quartile1: 'Lower quartile 1',
  upper_quartile1: 'Upper quartile 1',
  min1: 'Minimum 1',
  max1: 'Maximum 1',
  median2: 'Median 2',
  lower_quartile2: 'Lower quartile 2',
  upper_quartile2: 'Upper quartile 2',
  min2: 'Minimum 2',
  max2: 'Maximum 2',
  median: 'Median (ms)',
  lower_quartile: 'Lower quartile (ms)',
  upper_quartile: 'Upper quartile (ms)',
  min: 'Minimum (ms)',
  max: 'Maximum (ms)',
  ratio: 'Ratio (e.g. perceived/physical duration)',
  events1: 'Group 1: count of one response (e.g. “longer”)',
  nonevents1: 'Group 1: count of the other response (e.g. “shorter”)',
  events2: 'Group 2: count of the one response',
  nonevents2: 'Group 2: count of the other response',
};

/**
 * A calculation message in the sheet's own field labels: every reported field the form uses, named by its key in
 * the engine's message ("sd2 must be a positive finite number"), is said by its label ("SD 2 must be …").
 */
export function inSheetWords(message: string, fields: readonly ReportedKey[]): string {
  const keys = [...fields].sort((a, b) => b.length - a.length);
  if (!keys.length) return message;
  const pattern = new RegExp(`(?<![\\w])(${keys.join('|')})(?![\\w])`, 'g');
  return message.replace(pattern, (key) => `“${REPORTED_LABELS[key as ReportedKey]}”`);
}
