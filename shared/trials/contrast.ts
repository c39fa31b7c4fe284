// From the fits of two conditions to one within-subject effect: the paired summary of a fitted parameter.
import { computeReported, type ComputedEffect, type Reported } from '../extraction/compute.js';
import { pairedSummary, type PairedSummary } from '../stats/paired-summary.js';
import { StatsInputError } from '../stats/errors.js';
import { parameterValue, RATIO_PARAMETERS, type CellFit, type TrialParameter } from './fits.js';

export const CONTRAST_MEASURES = ['mean_diff', 'log_ratio'] as const;
export type ContrastMeasure = (typeof CONTRAST_MEASURES)[number];

export interface ContrastRequest {
  parameter: TrialParameter;
  conditionA: string;
  conditionB: string;
  measure: ContrastMeasure;
}

export interface Contrast extends ContrastRequest {
  summary: PairedSummary;
  /** participants left out, with the reason in words */
  excluded: { participant: string; reason: string }[];
  form: 'mean_diff' | 'log_ratio_paired';
  reported: Reported;
  computed: ComputedEffect;
}

/**
 * Pairs each participant's fitted parameter in condition A and B (converged fits with a value; for a log
 * ratio, positive values) and codes A − B as a mean difference in ms — mean and SD of the differences, with
 * the observed r — or the log ratio of the mean values ln(mean A / mean B) with the paired variance on the
 * observed r (Lajeunesse 2011). No correlation is assumed. Throws StatsInputError when fewer than two
 * participants have both.
 */
export function deriveContrast(fits: readonly CellFit[], req: ContrastRequest): Contrast {
  if (req.conditionA === req.conditionB) throw new StatsInputError('choose two different conditions', 'conditionB');
  if (req.measure === 'log_ratio' && !RATIO_PARAMETERS.includes(req.parameter)) {
    throw new StatsInputError('a log ratio is offered for the JND and the window width only (values on a ratio scale)', 'measure');
  }
  const byParticipant = new Map<string, { a?: CellFit; b?: CellFit }>();
  for (const f of fits) {
    if (f.condition !== req.conditionA && f.condition !== req.conditionB) continue;
    const slot = byParticipant.get(f.participant) ?? {};
    if (f.condition === req.conditionA) slot.a = f;
    else slot.b = f;
    byParticipant.set(f.participant, slot);
  }
  const a: number[] = [];
  const b: number[] = [];
  const excluded: Contrast['excluded'] = [];
  for (const [participant, { a: fa, b: fb }] of byParticipant) {
    const missing = !fa ? req.conditionA : !fb ? req.conditionB : null;
    if (missing) {
      excluded.push({ participant, reason: `no trials in condition ${missing}` });
      continue;
    }
    const va = parameterValue(fa!.fit, req.parameter);
    const vb = parameterValue(fb!.fit, req.parameter);
    if (va === null || vb === null) {
      excluded.push({ participant, reason: `no ${req.parameter} in condition ${va === null ? req.conditionA : req.conditionB} (the fit did not converge or gives none)` });
      continue;
    }
    if (req.measure === 'log_ratio' && (va <= 0 || vb <= 0)) {
      excluded.push({ participant, reason: `a log ratio needs positive values (got ${va.toFixed(1)} and ${vb.toFixed(1)})` });
      continue;
    }
    a.push(va);
    b.push(vb);
  }
  if (a.length < 2) {
    throw new StatsInputError(`only ${a.length} participant${a.length === 1 ? ' has' : 's have'} a usable ${req.parameter} in both ${req.conditionA} and ${req.conditionB}; at least 2 are needed`, 'conditionA');
  }
  const s = pairedSummary(a, b);
  let form: Contrast['form'];
  let reported: Reported;
  if (req.measure === 'mean_diff') {
    form = 'mean_diff';
    reported = { mean_diff: s.mean_diff, sd_diff: s.sd_diff, n: s.n };
  } else {
    if (s.r === null) throw new StatsInputError('the values do not vary within a condition, so their correlation is undefined', 'conditionA');
    form = 'log_ratio_paired';
    reported = { mean1: s.mean1, sd1: s.sd1, mean2: s.mean2, sd2: s.sd2, n: s.n, r: s.r };
  }
  return { ...req, summary: s, excluded, form, reported, computed: computeReported(form, reported, null) };
}
