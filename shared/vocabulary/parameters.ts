import type { OutcomeKind } from './outcomes.js';
import type { Task } from './tasks.js';

/** What an effect measured (issue 11): each outcome kind allows some of these, each in some units. */
export const PARAMETERS = [
  'duration_ratio',
  'pse',
  'pss',
  'jnd',
  'window_width',
  'window_centre',
  'bisection_point',
  'weber_fraction',
  'recalibration_shift',
  'lag',
  'response_odds',
] as const;
export type Parameter = (typeof PARAMETERS)[number];

export const UNITS = ['ms', 'deg', 'percent', 'ratio', 'none'] as const;
export type Unit = (typeof UNITS)[number];

export const PARAMETER_LABELS: Record<Parameter, string> = {
  duration_ratio: 'Perceived-duration ratio',
  pse: 'PSE',
  pss: 'PSS',
  jnd: 'JND',
  window_width: 'Window width',
  window_centre: 'Window centre',
  bisection_point: 'Bisection point',
  weber_fraction: 'Weber fraction',
  recalibration_shift: 'Recalibration shift',
  lag: 'Lag',
  response_odds: 'Odds of a response',
};

export const UNIT_LABELS: Record<Unit, string> = { ms: 'ms', deg: 'deg', percent: '%', ratio: 'ratio', none: 'no unit' };

/** The units each parameter is measured in; the first is the usual one. */
export const PARAMETER_UNITS: Record<Parameter, readonly Unit[]> = {
  duration_ratio: ['ratio', 'percent'],
  pse: ['ms'],
  pss: ['ms'],
  jnd: ['ms', 'ratio'],
  window_width: ['ms'],
  window_centre: ['ms'],
  bisection_point: ['ms'],
  weber_fraction: ['none', 'percent'],
  recalibration_shift: ['ms'],
  lag: ['ms', 'deg'],
  response_odds: ['none'],
};

/** The parameters each outcome kind allows; the first is the usual one (an effect that names none takes it). */
export const OUTCOME_PARAMETERS: Record<OutcomeKind, readonly Parameter[]> = {
  duration_distortion: ['duration_ratio', 'pse', 'bisection_point', 'weber_fraction', 'response_odds'],
  simultaneity_window: ['window_width', 'window_centre'],
  temporal_order: ['pss', 'jnd', 'response_odds'],
  recalibration_shift: ['recalibration_shift', 'pss'],
  postdiction_window: ['window_width'],
  positional_lag: ['lag'],
};

/** Which way round a positive effect is, per outcome kind (the sheet and the synthesis state it). */
export const SIGN_CONVENTIONS: Record<OutcomeKind, string> = {
  duration_distortion: 'positive = the manipulation lengthens perceived duration (for a PSE or bisection point a lower value means longer)',
  simultaneity_window: 'positive = the manipulation widens the window, or moves its centre towards the second signal lagging',
  temporal_order: 'positive = the PSS moves towards the manipulated signal leading, or the JND grows',
  recalibration_shift: 'positive = the PSS moves in the direction of the adapted lag',
  postdiction_window: 'positive = later information alters the earlier percept over a longer interval',
  positional_lag: 'positive = the moving object is seen further along its path',
};

/**
 * Where a lower value means the manipulation lengthened perceived duration, so the sheet reverses the sign of the
 * contrast (manipulation − control) to keep the outcome kind's convention: per outcome kind, parameter and the tasks it
 * applies in. In two-interval comparison the PSE is taken as the manipulated stimulus's duration judged equal to the standard.
 */
export const LOWER_MEANS_LONGER: Partial<Record<OutcomeKind, Partial<Record<Parameter, readonly Task[]>>>> = {
  duration_distortion: {
    pse: ['bisection', 'two_interval_comparison'],
    bisection_point: ['bisection', 'two_interval_comparison', 'reproduction', 'verbal_estimation', 'other'],
  },
};

/** Why an effect's sign is reversed (null when it is not): its outcome kind, parameter and its study's task decide. */
export function signReversal(e: { outcome?: OutcomeKind | null; parameter?: Parameter | null; unit?: Unit | null }, task: Task | null | undefined): string | null {
  const q = effectQuantity(e);
  if (!e.outcome || !q || !task || !LOWER_MEANS_LONGER[e.outcome]?.[q.parameter]?.includes(task)) return null;
  return `for a ${PARAMETER_LABELS[q.parameter]} in ${task.replace(/_/g, ' ')} a lower value means the manipulation lengthened perceived duration (${SIGN_CONVENTIONS[e.outcome].split(' (')[0]})`;
}

export const quantityLabel = (parameter: string, unit: string) =>
  `${PARAMETER_LABELS[parameter as Parameter] ?? parameter} (${UNIT_LABELS[unit as Unit] ?? unit})`;

/** Report forms that measure one parameter whatever the outcome kind: 2×2 counts are the odds of a response. */
const FORM_PARAMETERS: Partial<Record<string, Parameter>> = { counts_2x2: 'response_odds', counts_smd: 'response_odds' };

/**
 * The parameter and unit an effect stands for: its own, or the usual ones of its report form (2×2 counts) or
 * outcome kind (null without an outcome).
 */
export function effectQuantity(e: { outcome?: OutcomeKind | null; parameter?: Parameter | null; unit?: Unit | null; form?: string | null }): { parameter: Parameter; unit: Unit } | null {
  const parameter = e.parameter ?? (e.outcome ? ((e.form ? FORM_PARAMETERS[e.form] : undefined) ?? OUTCOME_PARAMETERS[e.outcome][0]) : null);
  if (!parameter) return null;
  return { parameter, unit: e.unit ?? PARAMETER_UNITS[parameter][0] };
}

/** One click that makes a refused effect allowed: the fields to set on it. */
export interface QuantityChoice {
  label: string;
  set: { outcome?: OutcomeKind; parameter?: Parameter; unit?: Unit };
}

export interface QuantityProblem {
  field: 'parameter' | 'unit';
  message: string;
  choices: QuantityChoice[];
}

/**
 * Whether an effect's outcome kind, parameter and unit go together; when not, what is wrong and the allowed
 * combinations nearest to it (keep the outcome and change the parameter, or keep the parameter and change the outcome).
 */
export function quantityProblem(
  e: { outcome?: OutcomeKind | null; parameter?: Parameter | null; unit?: Unit | null; form?: string | null },
  outcomeLabel: (k: OutcomeKind) => string,
): QuantityProblem | null {
  const q = effectQuantity(e);
  if (!q) return null;
  if (e.outcome && !OUTCOME_PARAMETERS[e.outcome].includes(q.parameter)) {
    const choices: QuantityChoice[] = OUTCOME_PARAMETERS[e.outcome].map((p) => {
      const unit = PARAMETER_UNITS[p].includes(q.unit) ? q.unit : PARAMETER_UNITS[p][0];
      return { label: `${quantityLabel(p, unit)}`, set: { parameter: p, unit } };
    });
    for (const k of Object.keys(OUTCOME_PARAMETERS) as OutcomeKind[])
      if (OUTCOME_PARAMETERS[k].includes(q.parameter) && PARAMETER_UNITS[q.parameter].includes(q.unit))
        choices.push({ label: `Keep ${quantityLabel(q.parameter, q.unit)}: outcome kind ${outcomeLabel(k)}`, set: { outcome: k } });
    return {
      field: 'parameter',
      message: `${outcomeLabel(e.outcome)} records ${OUTCOME_PARAMETERS[e.outcome].map((p) => PARAMETER_LABELS[p]).join(', ')}, not ${PARAMETER_LABELS[q.parameter]}`,
      choices,
    };
  }
  if (!PARAMETER_UNITS[q.parameter].includes(q.unit))
    return {
      field: 'unit',
      message: `${PARAMETER_LABELS[q.parameter]} is measured in ${PARAMETER_UNITS[q.parameter].map((u) => UNIT_LABELS[u]).join(' or ')}, not ${UNIT_LABELS[q.unit]}`,
      choices: PARAMETER_UNITS[q.parameter].map((u) => ({ label: quantityLabel(q.parameter, u), set: { unit: u } })),
    };
  return null;
}
