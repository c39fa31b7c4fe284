import Papa from 'papaparse';
import { REPORTED_KEYS, tryComputeReported, type Reported } from './compute.js';
import { effectDraftSchema, studyDraftSchema, type EffectSheet, type StudySheet } from '../schemas/extraction.js';
import { OUTCOMES } from '../vocabulary/outcomes.js';
import { PARAMETERS, UNITS, quantityProblem } from '../vocabulary/parameters.js';

export interface CsvRow {
  study: Omit<StudySheet, 'effects'> & { effects: EffectSheet[] };
  effect: EffectSheet;
}

const STUDY_COLUMNS = ['study', 'design', 'n1_study', 'n2_study', 'population', 'diagnosis', 'modality', 'task', 'standard_ms'];
const EFFECT_COLUMNS = ['label', 'outcome', 'parameter', 'unit', 'manipulation', 'form', ...REPORTED_KEYS, 'assumed_r', 'page', 'locator', 'quote'];
export const CSV_COLUMNS = [...STUDY_COLUMNS, ...EFFECT_COLUMNS];

/** A refused quantity's choices in the CSV's own terms. */
function csvChoices(choices: NonNullable<ReturnType<typeof quantityProblem>>['choices']): string {
  const set = choices.map((c) => Object.entries(c.set).map(([k, v]) => `${k} ${v}`).join(' with '));
  return `allowed: ${set.join('; ')}`;
}

/** Parses bulk-entry CSV rows into studies and effects; every bad row gets its own message. */
export function parseEffectsCsv(text: string): { rows: CsvRow[]; errors: { row: number; message: string }[] } {
  const parsed = Papa.parse<Record<string, string>>(text.trim(), { header: true, skipEmptyLines: true, transformHeader: (h) => h.trim().toLowerCase() });
  const rows: CsvRow[] = [];
  const errors: { row: number; message: string }[] = [];
  for (const e of parsed.errors) errors.push({ row: (e.row ?? 0) + 2, message: e.message });
  const unknown = (parsed.meta.fields ?? []).filter((f) => !CSV_COLUMNS.includes(f));
  if (unknown.length) errors.push({ row: 1, message: `unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}` });
  parsed.data.forEach((raw, idx) => {
    const line = idx + 2; // the header is line 1
    const val = (k: string) => (raw[k] === undefined || raw[k].trim() === '' ? undefined : raw[k].trim());
    const reported: Record<string, unknown> = {};
    for (const k of REPORTED_KEYS) if (val(k) !== undefined) reported[k] = val(k);
    const study = studyDraftSchema.safeParse({
      label: val('study') ?? 'Experiment 1', design: val('design'), n1: val('n1_study'), n2: val('n2_study'), population: val('population'),
      diagnosis: val('diagnosis'), modality: val('modality'), task: val('task'), standardMs: val('standard_ms'), effects: [],
    });
    // a parameter or unit outside the vocabulary is named with the terms the column takes
    const termProblems: string[] = [];
    const term = (k: 'parameter' | 'unit', terms: readonly string[]) => {
      const v = val(k);
      if (v === undefined || terms.includes(v)) return v;
      termProblems.push(`${k}: “${v}” is not one of ${terms.join(', ')}`);
      return undefined;
    };
    const effect = effectDraftSchema.safeParse({
      label: val('label'), outcome: val('outcome'), parameter: term('parameter', PARAMETERS), unit: term('unit', UNITS), manipulation: val('manipulation'), form: val('form'), reported, assumedR: val('assumed_r'),
      page: val('page'), locator: val('locator'), quote: val('quote'),
    });
    const problems = [
      ...(study.success ? [] : study.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)),
      ...(effect.success ? [] : effect.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)),
      ...termProblems,
    ];
    if (effect.success) {
      if (!effect.data.outcome) problems.push('outcome: choose an outcome kind');
      const quantity = termProblems.length ? null : quantityProblem(effect.data, (k) => OUTCOMES[k].label);
      if (quantity) problems.push(`${quantity.field}: ${quantity.message} (${csvChoices(quantity.choices)})`);
      if (!effect.data.manipulation) problems.push('manipulation: give a vocabulary term');
      if (!effect.data.form) problems.push('form: say how the result was reported');
      else {
        const c = tryComputeReported(effect.data.form, effect.data.reported as Reported, effect.data.assumedR);
        if (!c.ok) problems.push(c.error!);
      }
    }
    if (problems.length) errors.push({ row: line, message: problems.join('; ') });
    else rows.push({ study: study.data! as CsvRow['study'], effect: effect.data! });
  });
  return { rows, errors };
}

