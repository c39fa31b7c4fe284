import { numbersAgree, type Sheet, type StoredStudy } from '../../shared/schemas/extraction.js';
import type { ImpliedEffect } from '../../shared/schemas/reconciliation.js';
import { computeReported, type Reported } from '../../shared/extraction/compute.js';

/** The categorical and numeric fields compared between two coders, per study and per effect. */
export const STUDY_CATEGORICAL = ['design', 'population', 'diagnosis', 'modality', 'task'] as const;
export const STUDY_NUMERIC = ['n1', 'n2', 'standardMs'] as const;
export const EFFECT_CATEGORICAL = ['outcome', 'manipulation', 'parameter', 'unit', 'metric'] as const;

export const FIELD_LABELS: Record<string, string> = {
  studies: 'number of studies',
  effects: 'number of effects',
  design: 'design',
  population: 'population',
  diagnosis: 'diagnosis',
  modality: 'modality',
  task: 'task',
  n1: 'sample size (group 1 / all)',
  n2: 'sample size (group 2)',
  standardMs: 'standard duration (ms)',
  outcome: 'outcome kind',
  manipulation: 'manipulation',
  parameter: 'parameter (what was measured)',
  unit: 'unit',
  metric: 'metric',
  effect: 'effect size and variance',
};

export interface EffectValue {
  form: string | null;
  reported: Reported;
  assumedR: number | null;
  metric: string | null;
  effect: number | null;
  variance: number | null;
}

export interface Discrepancy {
  path: string;
  field: string;
  label: string;
  valueA: unknown;
  valueB: unknown;
}

export function effectValue(e: Sheet['studies'][number]['effects'][number]): EffectValue {
  let c: { metric: string; effect: number; variance: number } | null = null;
  try {
    c = e.form ? computeReported(e.form, e.reported as Reported, e.assumedR ?? null) : null;
  } catch {
    c = null;
  }
  return { form: e.form ?? null, reported: e.reported as Reported, assumedR: e.assumedR ?? null, metric: c?.metric ?? null, effect: c?.effect ?? null, variance: c?.variance ?? null };
}

const norm = (v: unknown) => (typeof v === 'string' ? v.trim().toLowerCase() : (v ?? null));

/**
 * Compares two coders' sheets field by field, aligned by study and effect position: categories exactly
 * (text case- and space-insensitively), numbers within TOLERANCE, effect sizes by effect and variance.
 */
export function compareSheets(a: Sheet, b: Sheet): Discrepancy[] {
  const out: Discrepancy[] = [];
  const push = (path: string, field: string, label: string, valueA: unknown, valueB: unknown) => out.push({ path, field, label, valueA, valueB });
  if (a.studies.length !== b.studies.length) push('studies', 'studies', 'Number of studies', a.studies.length, b.studies.length);
  const common = Math.min(a.studies.length, b.studies.length);
  for (let i = 0; i < common; i++) {
    const sa = a.studies[i];
    const sb = b.studies[i];
    const at = `Study ${i + 1}`;
    for (const f of STUDY_CATEGORICAL) if (norm(sa[f]) !== norm(sb[f])) push(`studies.${i}.${f}`, f, `${at}: ${FIELD_LABELS[f]}`, sa[f] ?? null, sb[f] ?? null);
    for (const f of STUDY_NUMERIC) if (!numbersAgree(sa[f], sb[f])) push(`studies.${i}.${f}`, f, `${at}: ${FIELD_LABELS[f]}`, sa[f] ?? null, sb[f] ?? null);
    const ea = a.studies[i].effects;
    const eb = b.studies[i].effects;
    if (ea.length !== eb.length) push(`studies.${i}.effects`, 'effects', `${at}: number of effects`, ea.length, eb.length);
    for (let j = 0; j < Math.min(ea.length, eb.length); j++) {
      const va = effectValue(ea[j]);
      const vb = effectValue(eb[j]);
      const et = `${at}, effect ${j + 1}`;
      for (const f of ['outcome', 'manipulation', 'parameter', 'unit'] as const) {
        if (norm(ea[j][f]) !== norm(eb[j][f])) push(`studies.${i}.effects.${j}.${f}`, f, `${et}: ${FIELD_LABELS[f]}`, ea[j][f] ?? null, eb[j][f] ?? null);
      }
      if (va.metric !== vb.metric || !numbersAgree(va.effect, vb.effect) || !numbersAgree(va.variance, vb.variance)) {
        push(`studies.${i}.effects.${j}.effect`, 'effect', `${et}: ${FIELD_LABELS.effect}`, va, vb);
      }
    }
  }
  return out;
}

/**
 * The effects one coder's stored sheet computes where a discrepancy sits: the effect itself for an effect's field,
 * every effect of the study for a study's field or effect count, every effect for the study count.
 */
export function impliedEffects(path: string, studies: StoredStudy[]): ImpliedEffect[] {
  const [, i, sub, j] = path.split('.');
  const out: ImpliedEffect[] = [];
  studies.forEach((s, si) => {
    if (i !== undefined && si !== Number(i)) return;
    s.effects.forEach((e, ej) => {
      if (sub === 'effects' && j !== undefined && ej !== Number(j)) return;
      const c = e.computed;
      out.push({ label: `Study ${si + 1}, effect ${ej + 1}${e.label ? ` (${e.label})` : ''}`, metric: c?.metric ?? null, effect: c?.effect ?? null, variance: c?.variance ?? null });
    });
  });
  return out;
}

export interface Resolution {
  path: string;
  field: string;
  value: unknown;
  structural: 'a' | 'b' | null;
}

/**
 * Builds the settled sheet: coder A's sheet with every resolved discrepancy applied (a count taken from
 * B takes B's list; a field takes the chosen side's value or the curator's own).
 */
export function mergeSheets(a: Sheet, b: Sheet, resolutions: Resolution[]): Sheet {
  const merged: Sheet = structuredClone(a);
  const depth = (r: Resolution) => (r.field === 'studies' ? 0 : r.field === 'effects' ? 1 : 2);
  for (const r of [...resolutions].sort((x, y) => depth(x) - depth(y))) {
    const parts = r.path.split('.');
    if (r.field === 'studies') {
      if (r.structural === 'b') merged.studies = structuredClone(b.studies);
      continue;
    }
    const i = Number(parts[1]);
    if (r.field === 'effects') {
      if (r.structural === 'b') merged.studies[i].effects = structuredClone(b.studies[i].effects);
      continue;
    }
    if (parts[2] === 'effects') {
      const e = merged.studies[i].effects[Number(parts[3])] as Record<string, unknown>;
      if (r.field === 'effect') {
        const v = r.value as Partial<EffectValue>;
        e.form = v.form ?? undefined;
        e.reported = { ...(v.reported ?? {}) };
        e.assumedR = v.assumedR ?? undefined;
      } else e[r.field] = r.value ?? undefined;
    } else (merged.studies[i] as Record<string, unknown>)[r.field] = r.value ?? undefined;
  }
  return merged;
}
