// What a fit of one participant × condition says, and what the fit table flags about it.
import type { BootstrapInterval, PsychometricFit, SimultaneityFit } from '../psychophysics/index.js';

/** The judgement the trials come from: order and duration give a psychometric function, simultaneity a window. */
export const TRIAL_TASKS = ['order', 'duration', 'simultaneity'] as const;
export type TrialTask = (typeof TRIAL_TASKS)[number];

export const TRIAL_TASK_LABELS: Record<TrialTask, string> = {
  order: 'Temporal order judgement (response 1 = "second stimulus first")',
  duration: 'Duration comparison (response 1 = "comparison longer")',
  simultaneity: 'Simultaneity judgement (response 1 = "simultaneous")',
};

/** The fitted parameters a contributor can code, by task. */
export const TRIAL_PARAMETERS = ['pse', 'jnd', 'width', 'centre'] as const;
export type TrialParameter = (typeof TRIAL_PARAMETERS)[number];

export const PARAMETERS_OF_TASK: Record<TrialTask, readonly TrialParameter[]> = {
  order: ['pse', 'jnd'],
  duration: ['pse', 'jnd'],
  simultaneity: ['width', 'centre'],
};

export function parameterLabel(p: TrialParameter, task: TrialTask): string {
  if (p === 'pse') return task === 'order' ? 'PSS (point of subjective simultaneity)' : 'PSE (point of subjective equality)';
  if (p === 'jnd') return 'JND (just noticeable difference)';
  if (p === 'width') return 'window width';
  return 'window centre';
}

/** Parameters on a ratio scale (positive), for which a log ratio of the two conditions is offered. */
export const RATIO_PARAMETERS: readonly TrialParameter[] = ['jnd', 'width'];

export interface CellFit {
  participant: string;
  condition: string;
  kind: 'psychometric' | 'simultaneity';
  /** the tested levels (ms) and trials per level */
  x: number[];
  n: number[];
  k: number[];
  fit: PsychometricFit | SimultaneityFit;
  ci: Record<string, BootstrapInterval | null>;
  resamples: number;
  failed: number;
  flags: FitFlag[];
}

export type FlagCode = 'not_converged' | 'outside_range' | 'no_width' | 'narrow_window' | 'wide_window' | 'audiovisual_band';

export interface FitFlag {
  code: FlagCode;
  message: string;
  /** a rule of thumb of the field, not a property of the data */
  commonPractice: boolean;
}

/** Windows narrower or wider than this are unusual for simultaneity judgements (common practice). */
export const WINDOW_PLAUSIBLE_MS = { min: 20, max: 500 } as const;
/** The usual audiovisual tolerance band, and how far from it a value is flagged (common practice). */
export const AUDIOVISUAL_BAND_MS = { low: 80, high: 100, flagBelow: 40, flagAbove: 200 } as const;

const ms = (v: number) => `${Math.round(v)} ms`;

/** The value of a parameter in one fit, or null when the fit gives none. */
export function parameterValue(fit: PsychometricFit | SimultaneityFit, p: TrialParameter): number | null {
  if ('pse' in fit) return p === 'pse' ? fit.pse : p === 'jnd' ? fit.jnd : null;
  return p === 'width' ? fit.width : p === 'centre' ? fit.centre : null;
}

/**
 * Flags of one fit: data problems (no convergence, a PSE or centre outside the tested levels, a window whose
 * peak stays below 0.5) and plausibility warnings from common practice (windows below 20 ms or above 500 ms;
 * audiovisual tolerance bands — the JND of an order task, half the width of a simultaneity window — far
 * from the usual 80–100 ms, that is below 40 or above 200 ms).
 */
export function flagFit(fit: PsychometricFit | SimultaneityFit, x: readonly number[], audiovisual: boolean): FitFlag[] {
  const flags: FitFlag[] = [];
  const lo = Math.min(...x);
  const hi = Math.max(...x);
  if (!fit.converged) {
    flags.push({ code: 'not_converged', message: 'the fit did not converge (for instance all answers one way): no estimate', commonPractice: false });
    return flags;
  }
  const band = (value: number, what: string) => {
    if (audiovisual && (value < AUDIOVISUAL_BAND_MS.flagBelow || value > AUDIOVISUAL_BAND_MS.flagAbove)) {
      flags.push({
        code: 'audiovisual_band',
        message: `${what} of ${ms(value)} is far from the usual audiovisual ${AUDIOVISUAL_BAND_MS.low}–${AUDIOVISUAL_BAND_MS.high} ms`,
        commonPractice: true,
      });
    }
  };
  if ('pse' in fit) {
    if (fit.pse !== null && (fit.pse < lo || fit.pse > hi)) {
      flags.push({ code: 'outside_range', message: `the PSE (${ms(fit.pse)}) lies outside the tested levels (${ms(lo)} to ${ms(hi)})`, commonPractice: false });
    }
    if (fit.jnd !== null) band(Math.abs(fit.jnd), 'a JND');
    return flags;
  }
  if (fit.centre !== null && (fit.centre < lo || fit.centre > hi)) {
    flags.push({ code: 'outside_range', message: `the window centre (${ms(fit.centre)}) lies outside the tested levels (${ms(lo)} to ${ms(hi)})`, commonPractice: false });
  }
  if (fit.width === null) {
    flags.push({ code: 'no_width', message: 'the peak of the window stays below 0.5 "simultaneous", so it has no width', commonPractice: false });
    return flags;
  }
  if (fit.width < WINDOW_PLAUSIBLE_MS.min) {
    flags.push({ code: 'narrow_window', message: `a window of ${ms(fit.width)} is narrower than ${WINDOW_PLAUSIBLE_MS.min} ms`, commonPractice: true });
  }
  if (fit.width > WINDOW_PLAUSIBLE_MS.max) {
    flags.push({ code: 'wide_window', message: `a window of ${ms(fit.width)} is wider than ${WINDOW_PLAUSIBLE_MS.max} ms`, commonPractice: true });
  }
  band(fit.width / 2, 'a tolerance band (half the window)');
  return flags;
}
