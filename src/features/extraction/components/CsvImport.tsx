import Papa from 'papaparse';
import { useState } from 'react';
import { REPORTED_KEYS, tryComputeReported, type Reported } from '../../../../shared/extraction/compute';
import { effectDraftSchema, studyDraftSchema, type EffectSheet, type StudySheet } from '../../../../shared/schemas/extraction';
import { Button } from '../../../components/ui/Button';

export interface CsvRow {
  study: Omit<StudySheet, 'effects'> & { effects: EffectSheet[] };
  effect: EffectSheet;
}

const STUDY_COLUMNS = ['study', 'design', 'n1_study', 'n2_study', 'population', 'diagnosis', 'modality', 'task', 'standard_ms'];
const EFFECT_COLUMNS = ['label', 'outcome', 'manipulation', 'form', ...REPORTED_KEYS, 'assumed_r', 'page', 'locator', 'quote'];
export const CSV_COLUMNS = [...STUDY_COLUMNS, ...EFFECT_COLUMNS];

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
    const effect = effectDraftSchema.safeParse({
      label: val('label'), outcome: val('outcome'), manipulation: val('manipulation'), form: val('form'), reported, assumedR: val('assumed_r'),
      page: val('page'), locator: val('locator'), quote: val('quote'),
    });
    const problems = [
      ...(study.success ? [] : study.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)),
      ...(effect.success ? [] : effect.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`)),
    ];
    if (effect.success) {
      if (!effect.data.outcome) problems.push('outcome: choose an outcome kind');
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

/** Bulk entry: paste or load a CSV; good rows join the sheet, bad rows are listed with their line. */
export function CsvImport({ onRows }: { onRows: (rows: CsvRow[]) => void }) {
  const [text, setText] = useState('');
  const [report, setReport] = useState<{ added: number; errors: { row: number; message: string }[] } | null>(null);
  const run = (t: string) => {
    const { rows, errors } = parseEffectsCsv(t);
    if (rows.length) onRows(rows);
    setReport({ added: rows.length, errors });
  };
  return (
    <details className="mt-6 rounded border border-paper-edge p-3">
      <summary className="cursor-pointer text-sm font-semibold">Add effects from a CSV (bulk entry)</summary>
      <p className="mt-2 text-xs text-ink-soft">
        One row per effect, with a header row. Columns: <code>{CSV_COLUMNS.join(', ')}</code>. Rows with the same <code>study</code> label join one study;
        values use the sheet's terms (e.g. <code>within</code>, <code>healthy_adults</code>, <code>duration_distortion</code>, <code>smd_paired</code>).
      </p>
      <label className="mt-2 block text-sm">
        CSV file <input type="file" accept=".csv,text/csv" onChange={async (e) => e.target.files?.[0] && run(await e.target.files[0].text())} />
      </label>
      <label className="mt-2 block text-sm">
        <span className="block text-xs font-semibold text-ink-soft">or paste rows</span>
        <textarea className="w-full rounded border border-paper-edge bg-white px-2 py-1 font-mono text-xs" rows={4} value={text} onChange={(e) => setText(e.target.value)} />
      </label>
      <Button className="mt-2" onClick={() => run(text)} disabled={!text.trim()}>
        Add the rows
      </Button>
      {report && (
        <div className="mt-2 text-sm" role="status">
          <p>✓ {report.added} row{report.added === 1 ? '' : 's'} added to the sheet.</p>
          {report.errors.length > 0 && (
            <ul className="text-refusal" aria-label="Rows not added">
              {report.errors.map((e) => (
                <li key={`${e.row}-${e.message}`}>
                  ✕ Line {e.row}: {e.message}
                </li>
              ))}
            </ul>
          )}
        </div>
      )}
    </details>
  );
}
