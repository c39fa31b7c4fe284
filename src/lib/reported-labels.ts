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
  percent: 'Percent change',
  se: 'SE of the percent change',
};
