import type { EffectSheet, StudySheet } from '../schemas/extraction.js';
import type { ComputedEffect, Reported } from './compute.js';

/**
 * Plausibility checks for the sheet. They never block a save: the thresholds are common practice in
 * time-perception work, not rules, and the screen says so.
 */
export interface Warning {
  field: string;
  message: string;
}

export function effectWarnings(e: EffectSheet, study: StudySheet | undefined, computed: ComputedEffect | null): Warning[] {
  const w: Warning[] = [];
  const r = (e.reported ?? {}) as Reported;
  if (r.r !== undefined && (r.r < -1 || r.r > 1)) w.push({ field: 'reported.r', message: 'a correlation must lie in [−1, 1]' });
  if (e.assumedR !== undefined && e.assumedR < 0) w.push({ field: 'assumedR', message: 'a negative correlation between conditions is rare in within-subject timing data' });
  if (e.outcome === 'simultaneity_window' && r.mean !== undefined && (r.mean < 10 || r.mean > 1000))
    w.push({ field: 'reported.mean', message: 'a simultaneity window below 10 ms or above 1,000 ms is implausible' });
  if (e.outcome === 'postdiction_window' && r.mean !== undefined && (r.mean < 0 || r.mean > 1000))
    w.push({ field: 'reported.mean', message: 'a postdiction window outside 0–1,000 ms is implausible' });
  for (const k of ['sd1', 'sd2', 'sd'] as const) {
    const m = k === 'sd' ? r.mean : r[k === 'sd1' ? 'mean1' : 'mean2'];
    const sd = r[k];
    if (sd !== undefined && m !== undefined && m > 0 && sd > m) w.push({ field: `reported.${k}`, message: 'an SD larger than its mean duration is unusual; check it is not a variance or a sum' });
  }
  for (const k of ['n1', 'n2', 'n'] as const) {
    if (r[k] !== undefined && r[k]! < 5) w.push({ field: `reported.${k}`, message: 'fewer than 5 participants is unusually small' });
  }
  if (r.percent !== undefined && Math.abs(r.percent) > 100) w.push({ field: 'reported.percent', message: 'a change of more than 100% of the physical duration is implausible' });
  if (study?.n1 !== undefined && r.n1 !== undefined && study.design === 'between' && r.n1 > study.n1) w.push({ field: 'reported.n1', message: 'more participants than the study reports' });
  if (study?.design === 'within' && (e.form === 'smd' || e.form === 'log_ratio' || e.form === 'counts_2x2' || e.form === 'counts_smd')) w.push({ field: 'form', message: 'the study is within subject but this form treats the conditions as independent groups' });
  if (study?.design === 'between' && (e.form === 'smd_paired' || e.form === 'log_ratio_paired')) w.push({ field: 'form', message: 'the study is between groups but this form is for within-subject contrasts' });
  if (computed && computed.metric.startsWith('g_') && Math.abs(computed.effect) > 3) w.push({ field: 'effect', message: "|g| above 3 is far outside this literature (typically 0.1–0.8); check the SDs are not SEs" });
  if (computed?.metric === 'log_ratio' && Math.abs(computed.effect) > 0.7) w.push({ field: 'effect', message: 'a log ratio beyond ±0.7 (a factor of 2) is implausible for duration judgements' });
  return w;
}

export function studyWarnings(s: StudySheet): Warning[] {
  const w: Warning[] = [];
  if (s.standardMs !== undefined && (s.standardMs < 50 || s.standardMs > 30000)) w.push({ field: 'standardMs', message: 'a standard below 50 ms or above 30 s is outside the usual range' });
  if (s.n1 !== undefined && s.n1 > 500) w.push({ field: 'n1', message: 'more than 500 participants is unusual for a psychophysics experiment' });
  return w;
}
