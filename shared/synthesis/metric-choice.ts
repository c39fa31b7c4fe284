import { RAW_SCORE_SMDS, SMD_FAMILY_METRICS, isRawScoreSmd, LEGACY_SMD_KEY, type Metric, type SmdFamily } from '../stats/metrics.js';
import { METRIC_LABELS, OUTCOMES, SMD_FAMILY_LABELS, type OutcomeKind } from '../vocabulary/outcomes.js';
import { quantityLabel, type Parameter, type Unit } from '../vocabulary/parameters.js';
import type { SynthesisRequest } from '../schemas/synthesis.js';
import type { SettledEffect } from './types.js';

/** The metric key of a synthesis that pools a whole SMD family (it is no effect's own metric). */
export const FAMILY_METRIC: Record<SmdFamily, string> = { raw_score: 'smd_raw_score' };

/** A metric (or a family's pooled key, or a frozen snapshot's old key) in words. */
export function metricLabel(m: string): string {
  const family = (Object.keys(FAMILY_METRIC) as SmdFamily[]).find((f) => FAMILY_METRIC[f] === m);
  if (family) return SMD_FAMILY_LABELS[family];
  if (m === LEGACY_SMD_KEY) return "Hedges' g (standardizer not recorded)";
  return METRIC_LABELS[m as Metric] ?? m;
}

/** A request whose smdFamily and metric filter contradict each other (answered 400, naming the field). */
export class SmdFamilyFilterError extends Error {
  readonly path = 'smdFamily';
}

/** The metric filter a request means: its own, or every metric of the SMD family it pools. */
export function metricFilter(request: Pick<SynthesisRequest, 'filters' | 'smdFamily'>): string | string[] | undefined {
  const family = request.smdFamily;
  const m = request.filters.metric;
  if (!family) return m;
  const members = SMD_FAMILY_METRICS[family];
  if (m !== undefined && !members.includes(m))
    throw new SmdFamilyFilterError(`"smdFamily": "${family}" pools ${members.join(', ')}; leave the metric filter out or choose one of them (not ${m})`);
  return [...members];
}

/** One way to make a refused request poolable: a label and the whole request to send instead. */
export interface PoolingChoice {
  label: string;
  effects: number;
  request: SynthesisRequest;
}

/** Raised when the matching effects are not one quantity: never pooled together; the details offer the choices. */
export class MixedMetricsError extends Error {
  constructor(
    readonly metrics: Array<{ metric: string; count: number }>,
    readonly choices: PoolingChoice[],
  ) {
    const hasGz = metrics.some((m) => m.metric === 'g_z');
    const hasRaw = metrics.some((m) => isRawScoreSmd(m.metric));
    const inWords =
      `These effects use ${metrics.length} metrics (${metrics.map((m) => `${metricLabel(m.metric)}: ${m.count}`).join(', ')}); effects of different metrics are never pooled together.` +
      (hasGz && hasRaw ? ' A g_z (standardized by the SD of the differences) is never pooled with a g_s, g_av or g_rm.' : '') +
      ' Choose one to pool.';
    super(
      `These effects use ${metrics.length} metrics (${metrics.map((m) => `${m.metric}: ${m.count}`).join(', ')}); effects of different metrics are never pooled together.` +
        (hasGz && hasRaw ? ' g_z (standardized by the SD of the differences) is never pooled with g_s, g_av or g_rm.' : '') +
        (metrics.filter((m) => isRawScoreSmd(m.metric)).length > 1 ? ' g_s, g_av and g_rm pool together only when the request says "smdFamily": "raw_score".' : '') +
        ` Add a metric filter, e.g. "filters": { "metric": "${metrics[0].metric}" }, or take one of the choices.`,
    );
    this.inWords = inWords;
  }

  /** The refusal for a screen, which offers the choices as buttons: no request syntax. */
  readonly inWords: string;
}

const plural = (n: number, one: string) => `${n} ${one}${n === 1 ? '' : 's'}`;

/** Raised when the matching effects measured different parameters or used different units: never pooled together. */
export class MixedQuantitiesError extends Error {
  constructor(
    readonly quantities: Array<{ parameter: string | null; unit: string | null; label: string; count: number }>,
    readonly choices: PoolingChoice[],
  ) {
    super(
      `These effects measured ${quantities.length} different quantities (${quantities.map((q) => `${q.label}: ${q.count}`).join(', ')}); effects of different parameters or units are never pooled together.` +
        ` Add a parameter and unit filter, e.g. "filters": { "parameter": "${choices[0]?.request.filters.parameter ?? quantities[0].parameter}", "unit": "${choices[0]?.request.filters.unit ?? quantities[0].unit}" }, or take one of the choices.`,
    );
    this.inWords = `These effects measured ${quantities.length} different quantities (${quantities.map((q) => `${q.label}: ${q.count}`).join(', ')}); effects of different parameters or units are never pooled together. Choose one to pool.`;
  }

  /** The refusal for a screen, which offers the choices as buttons: no request syntax. */
  readonly inWords: string;
}

const NOT_RECORDED = 'parameter and unit not recorded';

const outcomeLabel = (o: string) => OUTCOMES[o as OutcomeKind]?.label ?? o;

/** Raised when the matching effects are of several outcome kinds: a synthesis pools one at a time. */
export class MixedOutcomesError extends Error {
  constructor(
    readonly outcomes: Array<{ outcome: string; label: string; count: number }>,
    readonly choices: PoolingChoice[],
  ) {
    super(
      `These effects are of ${outcomes.length} outcome kinds (${outcomes.map((o) => `${o.label}: ${o.count}`).join(', ')}); a synthesis pools one outcome kind, parameter, unit and metric at a time.` +
        ` Add an outcome filter, e.g. "filters": { "outcome": "${outcomes[0].outcome}" }, or take one of the choices.`,
    );
    this.inWords = `These effects are of ${outcomes.length} outcome kinds (${outcomes.map((o) => `${o.label}: ${o.count}`).join(', ')}); a synthesis pools one outcome kind, parameter, unit and metric at a time. Choose one to pool.`;
  }

  /** The refusal for a screen, which offers the choices as buttons: no request syntax. */
  readonly inWords: string;
}

/**
 * Refuses (MixedOutcomesError) effects of several outcome kinds, with one choice per outcome kind × parameter × unit
 * × metric among them (an SMD family the request pools counts as one metric), so each choice pools as it stands.
 */
export function assertOneOutcome(effects: readonly SettledEffect[], request: SynthesisRequest): void {
  const byOutcome = new Map<string, number>();
  for (const e of effects) byOutcome.set(e.outcome, (byOutcome.get(e.outcome) ?? 0) + 1);
  if (byOutcome.size <= 1) return;
  const outcomes = [...byOutcome]
    .map(([outcome, count]) => ({ outcome, label: outcomeLabel(outcome), count }))
    .sort((a, b) => b.count - a.count || (a.outcome < b.outcome ? -1 : 1));
  const family = request.smdFamily;
  const inFamily = (m: string) => !!family && SMD_FAMILY_METRICS[family].includes(m as Metric);
  const combos = new Map<string, { outcome: string; parameter: string | null; unit: string | null; metric: string | null; count: number }>();
  for (const e of effects) {
    const metric = inFamily(e.metric) ? null : e.metric;
    const key = [e.outcome, e.parameter ?? '', e.unit ?? '', metric ?? ''].join('\u0000');
    const c = combos.get(key);
    if (c) c.count++;
    else combos.set(key, { outcome: e.outcome, parameter: e.parameter ?? null, unit: e.unit ?? null, metric, count: 1 });
  }
  const choices: PoolingChoice[] = [...combos.values()]
    .filter((c) => c.parameter && c.unit)
    .sort((a, b) => b.count - a.count || (a.outcome < b.outcome ? -1 : a.outcome > b.outcome ? 1 : 0))
    .map((c) => {
      const { smdFamily: _drop, ...rest } = request;
      const filters = { ...request.filters, outcome: c.outcome as OutcomeKind, parameter: c.parameter as Parameter, unit: c.unit as Unit };
      const what = [outcomeLabel(c.outcome), quantityLabel(c.parameter!, c.unit!), metricLabel(c.metric ?? FAMILY_METRIC[family!])].join(' · ');
      return {
        label: `Only ${what} (${plural(c.count, 'effect')})`,
        effects: c.count,
        request: c.metric ? { ...rest, filters: { ...filters, metric: c.metric as Metric } } : { ...request, filters },
      };
    });
  throw new MixedOutcomesError(outcomes, choices);
}

/** Refuses (MixedQuantitiesError, one choice per parameter and unit) effects that are not one parameter in one unit. */
export function assertOneQuantity(effects: readonly SettledEffect[], request: SynthesisRequest): void {
  const byQuantity = new Map<string, { parameter: string | null; unit: string | null; count: number }>();
  for (const e of effects) {
    const key = `${e.parameter ?? ''}\u0000${e.unit ?? ''}`;
    const q = byQuantity.get(key);
    if (q) q.count++;
    else byQuantity.set(key, { parameter: e.parameter ?? null, unit: e.unit ?? null, count: 1 });
  }
  if (byQuantity.size <= 1) return;
  const quantities = [...byQuantity.values()]
    .map((q) => ({ ...q, label: q.parameter && q.unit ? quantityLabel(q.parameter, q.unit) : NOT_RECORDED }))
    .sort((a, b) => b.count - a.count || (a.label < b.label ? -1 : 1));
  const choices: PoolingChoice[] = quantities
    .filter((q) => q.parameter && q.unit)
    .map((q) => ({
      label: `Only ${q.label} (${plural(q.count, 'effect')})`,
      effects: q.count,
      request: { ...request, filters: { ...request.filters, parameter: q.parameter as Parameter, unit: q.unit as Unit } },
    }));
  throw new MixedQuantitiesError(quantities, choices);
}

/**
 * The one metric the effects are pooled in and its label; refuses (MixedOutcomesError) effects of several outcome
 * kinds, then (MixedMetricsError with one-click choices) when they are several metrics, unless they are all of the SMD family the request pools, and then (MixedQuantitiesError)
 * when they are not one parameter in one unit.
 */
export function pooledMetric(effects: readonly SettledEffect[], request: SynthesisRequest): { metric: string; label: string } {
  assertOneOutcome(effects, request);
  const byMetric = new Map<string, number>();
  for (const e of effects) byMetric.set(e.metric, (byMetric.get(e.metric) ?? 0) + 1);
  const family = request.smdFamily;
  if (family && [...byMetric.keys()].every((m) => SMD_FAMILY_METRICS[family].includes(m as Metric))) {
    assertOneQuantity(effects, request);
    return { metric: FAMILY_METRIC[family], label: metricLabel(FAMILY_METRIC[family]) };
  }
  if (byMetric.size <= 1) {
    // one metric: the effects must also be one parameter in one unit
    assertOneQuantity(effects, request);
    const metric = effects[0].metric;
    return { metric, label: metricLabel(metric) };
  }
  const metrics = [...byMetric].map(([metric, count]) => ({ metric, count })).sort((a, b) => b.count - a.count || (a.metric < b.metric ? -1 : 1));
  const { smdFamily: _drop, ...rest } = request;
  const choices: PoolingChoice[] = metrics.map((m) => ({
    label: `Only ${metricLabel(m.metric)} (${plural(m.count, 'effect')})`,
    effects: m.count,
    request: { ...rest, filters: { ...request.filters, metric: m.metric as Metric } },
  }));
  const raw = metrics.filter((m) => isRawScoreSmd(m.metric));
  if (raw.length > 1) {
    const n = raw.reduce((a, m) => a + m.count, 0);
    const { metric: _m, ...filters } = request.filters;
    choices.push({
      label: `${RAW_SCORE_SMDS.join(', ')} together as one raw-score standardized mean difference (${plural(n, 'effect')})`,
      effects: n,
      request: { ...rest, filters, smdFamily: 'raw_score' },
    });
  }
  throw new MixedMetricsError(metrics, choices);
}
