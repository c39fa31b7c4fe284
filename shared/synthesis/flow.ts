/**
 * The flow of records into one synthesis (PRISMA 2020), stage by stage. Pure: the server counts, this
 * arranges the counts into stages so that each stage starts with what the one before passed on.
 */

/** The synthesis filters in the order a reference is tested against them (the first one that leaves it no effect is its reason). */
export const FLOW_FILTER_STEPS = [
  { key: 'manipulation', fields: ['manipulation'], label: 'Another manipulation' },
  { key: 'outcome', fields: ['outcome'], label: 'Another outcome kind' },
  { key: 'metric', fields: ['metric'], label: 'Another metric' },
  { key: 'parameter', fields: ['parameter'], label: 'Another parameter' },
  { key: 'unit', fields: ['unit'], label: 'Another unit' },
  { key: 'population', fields: ['population'], label: 'Another population' },
  { key: 'modality', fields: ['modality'], label: 'Another modality' },
  { key: 'task', fields: ['task'], label: 'Another task' },
  { key: 'design', fields: ['design'], label: 'Another design' },
  { key: 'years', fields: ['yearFrom', 'yearTo'], label: 'Outside the years' },
  { key: 'bound', fields: ['excludeBound'], label: 'Only effects computed from a bound' },
  { key: 'approximate', fields: ['excludeApproximate'], label: 'Only approximate effects (from medians)' },
] as const;

export const NO_MANIPULATION_REASON = { reason: 'no_manipulation', label: 'No manipulation from the vocabulary coded' } as const;

export interface FlowReason {
  reason: string;
  label: string;
  count: number;
}

/** 'screening' (both screening stages in one) is how snapshots saved before the split keep their flow. */
export type FlowStageKey = 'title_abstract' | 'full_text' | 'screening' | 'coding' | 'reconciliation' | 'synthesis';

export interface FlowStage {
  stage: FlowStageKey;
  label: string;
  /** references that reached this stage */
  entered: number;
  /** references this stage passed on to the next */
  passed: number;
  /** references this stage set aside, with the reasons (largest first) */
  excluded: number;
  excludedByReason: FlowReason[];
  /** references still waiting at this stage (not excluded, not passed yet), with what they wait for */
  pending: number;
  pendingLabel: string | null;
}

export interface SynthesisFlowCounts {
  identified: { total: number; bySource: Record<string, number> };
  duplicatesRemoved: { total: number; importDuplicates: number; merged: number };
  /** each screening stage as the screening records count it: decided, waiting, included, excluded by reason */
  screeningStages: Record<'title_abstract' | 'full_text', ScreeningStageCounts>;
  reasonLabels: Record<string, string>;
  /** included references with a coding sheet past draft */
  coded: number;
  /** references with settled effects */
  settled: number;
  /** settled references outside the filters, by filter step key (see filterAttribution) */
  outsideByStep: Record<string, number>;
  entering: { references: number; studies: number; effects: number };
}

export interface ScreeningStageCounts {
  decided: number;
  waiting: number;
  included: number;
  excluded: number;
  excludedByReason: Record<string, number>;
}

export interface SynthesisFlow {
  identified: { total: number; bySource: Record<string, number> };
  duplicatesRemoved: { total: number; importDuplicates: number; merged: number };
  afterDuplicates: number;
  stages: FlowStage[];
  entering: { references: number; studies: number; effects: number };
}

const reasons = (counts: Record<string, number>, label: (r: string) => string): FlowReason[] =>
  Object.entries(counts)
    .filter(([, n]) => n > 0)
    .map(([reason, count]) => ({ reason, label: label(reason), count }))
    .sort((a, b) => b.count - a.count || (a.reason < b.reason ? -1 : 1));

const nonNegative = (name: string, n: number) => {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`flow count ${name} must be a whole number ≥ 0 (got ${n})`);
  return n;
};

/** Arranges the counts into the stages: title and abstract, full text, coding, reconciliation and this synthesis's filters. */
export function synthesisFlow(c: SynthesisFlowCounts): SynthesisFlow {
  const { title_abstract: ta, full_text: ft } = c.screeningStages;
  for (const [k, v] of Object.entries({ coded: c.coded, settled: c.settled, ...c.entering })) nonNegative(k, v);
  for (const [stage, counts] of Object.entries(c.screeningStages))
    for (const k of ['decided', 'waiting', 'included', 'excluded'] as const) nonNegative(`${stage}.${k}`, counts[k]);
  if (ft.decided + ft.waiting !== ta.included)
    throw new RangeError(`flow counts disagree: ${ta.included} passed title and abstract but ${ft.decided + ft.waiting} reached full text`);
  const included = ft.included;
  const label = (r: string) => c.reasonLabels[r] ?? r;
  const stepLabels: Record<string, string> = Object.fromEntries([...FLOW_FILTER_STEPS.map((s) => [s.key, s.label]), [NO_MANIPULATION_REASON.reason, NO_MANIPULATION_REASON.label]]);
  const filterReasons = reasons(c.outsideByStep, (r) => stepLabels[r] ?? r);
  const outside = c.settled - c.entering.references;
  return {
    identified: c.identified,
    duplicatesRemoved: c.duplicatesRemoved,
    afterDuplicates: c.identified.total - c.duplicatesRemoved.total,
    stages: [
      {
        stage: 'title_abstract',
        label: 'Titles and abstracts screened',
        entered: ta.decided + ta.waiting,
        passed: ta.included,
        excluded: ta.excluded,
        excludedByReason: reasons(ta.excludedByReason, label),
        pending: ta.waiting,
        pendingLabel: 'not yet screened',
      },
      {
        stage: 'full_text',
        label: 'Full texts assessed',
        entered: ta.included,
        passed: ft.included,
        excluded: ft.excluded,
        excludedByReason: reasons(ft.excludedByReason, label),
        pending: ft.waiting,
        pendingLabel: 'awaiting full-text screening',
      },
      { stage: 'coding', label: 'Reports coded', entered: included, passed: c.coded, excluded: 0, excludedByReason: [], pending: included - c.coded, pendingLabel: 'not yet coded' },
      { stage: 'reconciliation', label: 'Codings settled', entered: c.coded, passed: c.settled, excluded: 0, excludedByReason: [], pending: c.coded - c.settled, pendingLabel: 'not yet settled' },
      {
        stage: 'synthesis',
        label: 'Matched against this synthesis’s filters',
        entered: c.settled,
        passed: c.entering.references,
        excluded: outside,
        excludedByReason: filterReasons,
        pending: 0,
        pendingLabel: null,
      },
    ],
    entering: c.entering,
  };
}

interface AttributableEffect {
  referenceId: number;
}

/**
 * For each filter step the synthesis sets, in order, how many references still in play lose their last
 * effect to it (so each reference outside the filters is counted once, under the first filter that leaves
 * it nothing). `filter` is the registry's own filter (the one the synthesis uses).
 */
export function filterAttribution<E extends AttributableEffect, F extends object>(
  effects: readonly E[],
  filters: F,
  filter: (effects: readonly E[], f: Partial<F>) => E[],
): Record<string, number> {
  const out: Record<string, number> = {};
  let current = effects;
  for (const step of FLOW_FILTER_STEPS) {
    const given = filters as Record<string, unknown>;
    const part = Object.fromEntries(step.fields.filter((f) => given[f] !== undefined).map((f) => [f, given[f]])) as Partial<F>;
    if (!Object.keys(part).length) continue;
    const before = new Set(current.map((e) => e.referenceId));
    current = filter(current, part);
    const after = new Set(current.map((e) => e.referenceId));
    out[step.key] = before.size - after.size;
  }
  return out;
}

/** What enters: the effects, their studies and their references. */
export function enteringCounts(effects: ReadonlyArray<{ referenceId: number; studyId: number }>) {
  return { references: new Set(effects.map((e) => e.referenceId)).size, studies: new Set(effects.map((e) => e.studyId)).size, effects: effects.length };
}
