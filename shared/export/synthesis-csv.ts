import type { SettledEffectRow } from '../schemas/registry.js';
import type { SynthesisOutput } from '../synthesis/types.js';
import { toCsv } from './csv.js';

/** One row per pooled unit (what was pooled, analysis-ready): re-pooling effect and variance gives the synthesis's numbers. */
export function studiesCsv(output: SynthesisOutput, effects: readonly SettledEffectRow[]): string {
  const byId = new Map(effects.map((e) => [e.id, e]));
  const uniq = (xs: Array<string | number | null>) => [...new Set(xs.filter((x) => x != null))].join(';');
  const subgroup = output.request.subgroup;
  const rows = output.rows.map((r) => {
    const es = r.effectIds.map((id) => byId.get(id)).filter((e): e is SettledEffectRow => !!e);
    const std = es.map((e) => e.standardMs).filter((x): x is number => x != null);
    return {
      reference_id: r.referenceId,
      reference: es[0]?.referenceLabel ?? '',
      doi: es.find((e) => e.doi)?.doi ?? '',
      study_id: r.studyId,
      study: es[0]?.studyLabel ?? '',
      label: r.label,
      year: r.year ?? '',
      n: r.n ?? '',
      metric: output.metric,
      manipulation: uniq(es.map((e) => e.manipulation)),
      outcome: uniq(es.map((e) => e.outcome)),
      parameter: uniq(es.map((e) => e.parameter ?? null)),
      unit: uniq(es.map((e) => e.unit ?? null)),
      population: uniq(es.map((e) => e.population)),
      modality: uniq(es.map((e) => e.modality)),
      task: uniq(es.map((e) => e.task)),
      design: uniq(es.map((e) => e.design)),
      standard_ms: std.length ? std.reduce((a, b) => a + b, 0) / std.length : '',
      effect: r.effect,
      variance: r.variance,
      se: Math.sqrt(r.variance),
      weight_percent: r.weight,
      effects_combined: r.effectIds.length,
      effect_ids: r.effectIds.join(';'),
      ...(subgroup ? { subgroup: r.subgroup ?? '' } : {}),
    };
  });
  return toCsv(rows);
}

/** Every settled effect as it was coded (before combining within studies). */
export function effectsCsv(effects: readonly SettledEffectRow[]): string {
  const rows = effects.map((e) => ({
    effect_id: e.id,
    reference_id: e.referenceId,
    reference: e.referenceLabel,
    title: e.title,
    doi: e.doi ?? '',
    study_id: e.studyId,
    study: e.studyLabel,
    year: e.year ?? '',
    n: e.n ?? '',
    metric: e.metric,
    manipulation: e.manipulation,
    outcome: e.outcome,
    parameter: e.parameter ?? '',
    unit: e.unit ?? '',
    population: e.population ?? '',
    modality: e.modality ?? '',
    task: e.task ?? '',
    design: e.design ?? '',
    standard_ms: e.standardMs ?? '',
    effect: e.effect,
    variance: e.variance,
    formula: e.formula,
    // how the effect was computed: reversed to keep the outcome kind's sign convention, from a p bound, from medians
    sign_reversed: e.signReversed ?? '',
    from_bound: e.fromBound ?? '',
    approximate: e.approximate ?? '',
    label: e.label,
  }));
  return toCsv(rows);
}
