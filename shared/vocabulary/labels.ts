import { OUTCOMES, type OutcomeKind } from './outcomes.js';
import { POPULATION_LABELS } from './populations.js';
import { MODALITY_LABELS } from './modalities.js';
import { TASK_LABELS } from './tasks.js';
import { DESIGN_LABELS } from './designs.js';
import { PARAMETER_LABELS, UNIT_LABELS } from './parameters.js';
import { EXCLUSION_REASON_LABELS, REFERENCE_SOURCE_LABELS } from './screening.js';
import { DEFAULT_MANIPULATIONS } from './manipulations.js';
import { metricLabel } from '../synthesis/metric-choice.js';

/**
 * The one label table: every stored code a screen or an export may show, in words. Screens and exports
 * call `labelOf(kind, value)`; a code missing from the table is shown with its underscores as spaces,
 * never as the raw key.
 */
export const LABELS = {
  /** the shipped vocabulary's labels (curators may add terms: those show their words without underscores) */
  manipulation: Object.fromEntries(DEFAULT_MANIPULATIONS.map((m) => [m.term, m.label])) as Record<string, string>,
  outcome: Object.fromEntries(Object.entries(OUTCOMES).map(([k, v]) => [k, v.label])) as Record<OutcomeKind, string>,
  population: POPULATION_LABELS,
  modality: MODALITY_LABELS,
  task: TASK_LABELS,
  design: DESIGN_LABELS,
  parameter: PARAMETER_LABELS,
  unit: UNIT_LABELS,
  exclusionReason: EXCLUSION_REASON_LABELS,
  source: REFERENCE_SOURCE_LABELS,
  state: {
    draft: 'Draft',
    submitted: 'Submitted',
    matched: 'Matched',
    disputed: 'Disputed',
    settled: 'Settled',
    withdrawn: 'Withdrawn',
    coding: 'Coding',
    queued: 'Queued',
    sent: 'Sent',
    retrying: 'Retrying',
    failed: 'Failed',
    open: 'Open',
    resolved: 'Resolved',
  },
  screening: { unscreened: 'Not yet screened', awaiting_full_text: 'Awaiting full text', included: 'Included', excluded: 'Excluded' },
  filter: {
    manipulation: 'Manipulation', outcome: 'Outcome kind', parameter: 'Parameter', unit: 'Unit', metric: 'Metric', population: 'Population',
    modality: 'Modality', task: 'Task', design: 'Design', yearFrom: 'From year', yearTo: 'To year',
  },
  /** what an audit entry records (server/services write these action codes) */
  auditAction: {
    'user.created': 'Signed in for the first time',
    'role.granted': 'Role granted',
    'role.revoked': 'Role removed',
    'manipulation.create': 'Vocabulary term added',
    'manipulation.update': 'Vocabulary term edited',
    'token.created': 'API token created',
    'token.revoked': 'API token revoked',
    'import.create': 'Import started',
    'import.finish': 'Import finished',
    'import.fail': 'Import stopped',
    'reference.edit': 'Reference edited',
    'reference.merge': 'Duplicate references merged',
    'reference.duplicate_dismissed': 'Possible duplicate dismissed',
    'reference.attach': 'PDF attached',
    'screening.decide': 'Screening decision',
    'screening.undo': 'Screening decision taken back',
    'screening.rule': 'Screening rule set (one or two screeners)',
    'screening.vote': 'Blind screening vote cast',
    'screening.settle': 'Screening disagreement settled',
    'extraction.claim': 'Reference claimed for coding',
    'extraction.save': 'Coding sheet saved',
    'extraction.submit': 'Coding sheet submitted',
    'assignment.create': 'Double coding assigned',
    'assignment.matched': 'Codings matched',
    'assignment.disputed': 'Codings disputed',
    'assignment.settle': 'Pair settled',
    'discrepancy.resolve': 'Discrepancy decided',
    'record.settle': 'Record settled',
    'record.reopen': 'Record reopened',
    'record.withdraw': 'Record withdrawn',
    'record.restore': 'Record restored',
    'effect.edit': 'Effect corrected',
    'effect.withdraw': 'Effect withdrawn',
    'snapshot.created': 'Snapshot saved',
    'trials.upload': 'Trial data uploaded',
    'trials.fit': 'Trial data fitted',
    'mail.resent': 'Mail sent again',
  },
  /** the kinds of record an audit entry is about */
  record: {
    user: 'Person',
    api_token: 'API token',
    manipulation: 'Vocabulary term',
    import_batch: 'Import',
    reference: 'Reference',
    extraction: 'Coding sheet',
    assignment: 'Double-coding pair',
    discrepancy: 'Discrepancy',
    effect: 'Effect',
    snapshot: 'Snapshot',
    trial_set: 'Trial data set',
    screening_rule: 'Screening rule',
    mail: 'Mail',
  },
  moderator: { standardMs: 'Standard duration (ms)', year: 'Publication year', design: 'Design', modality: 'Modality', task: 'Task', population: 'Population' },
  subgroupTau2: { separate: 'A separate τ² in each subgroup', pooled: 'One τ² shared by all subgroups' },
  estimator: { FE: 'Fixed effect', DL: 'DerSimonian–Laird', REML: 'REML', PM: 'Paule–Mandel' },
  pMethod: { exact: 'exact (Kendall’s distribution)', normal: 'normal approximation' },
  test: { chisq: 'χ²', F: 'F (Knapp–Hartung)' },
  i2Definition: { q: 'from Q', tau: 'from τ²' },
  subgroup: { population: 'Population', modality: 'Modality', task: 'Task', design: 'Design', outcome: 'Outcome kind', manipulation: 'Manipulation' },
} as const satisfies Record<string, Record<string, string>>;

export type LabelKind = keyof typeof LABELS | 'metric';

/** A stored code in words (metrics through metricLabel, which knows SMD families and older keys). */
export function labelOf(kind: LabelKind | string, value: string): string {
  if (kind === 'metric') return metricLabel(value);
  const table = (LABELS as Record<string, Record<string, string>>)[kind];
  return table?.[value] ?? value.replace(/_/g, ' ');
}

/** Metrics reported in milliseconds (or degrees): their values to 1 decimal; every other metric to 3. */
const RAW_UNIT_METRICS = new Set(['raw_mean', 'mean_diff']);

/**
 * The one digits rule: decimals for a metric's values in tables, text and exports' display; plot labels,
 * where space is short, use one decimal fewer for standardized metrics.
 */
export function metricDigits(metric: string, where: 'table' | 'plot' = 'table'): number {
  if (RAW_UNIT_METRICS.has(metric)) return 1;
  return where === 'plot' ? 2 : 3;
}
