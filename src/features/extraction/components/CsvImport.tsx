import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { CSV_COLUMNS, parseEffectsCsv, type CsvRow } from '../../../../shared/extraction/csv';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { formResolver } from '../../../lib/forms/resolver';

const csvFormSchema = z.object({ text: z.string().trim().min(1, 'paste at least one row below the header, or choose a file') });

/**
 * Bulk entry: paste or load a CSV; good rows join the sheet, bad rows are listed with their line. It sits inside
 * the sheet's own form, so it is a form of its own without a <form> element.
 */
export function CsvImport({ onRows }: { onRows: (rows: CsvRow[]) => void }) {
  const form = useForm({ resolver: formResolver(csvFormSchema), defaultValues: { text: '' } });
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
      <Field label="or paste rows" error={form.formState.errors.text?.message} className="mt-2 text-sm">
        <textarea className="w-full rounded border border-paper-edge bg-white px-2 py-1 font-mono text-xs" rows={4} {...form.register('text')} />
      </Field>
      <Button className="mt-2" onClick={form.handleSubmit((v) => run(v.text))}>
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
