import { Controller, useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { resolveDiscrepancySchema } from '../../../../shared/schemas/extraction';
import { REPORT_FIELDS, REPORT_FORMS, REPORT_FORM_LABELS, tryComputeReported, type ReportForm, type Reported } from '../../../../shared/extraction/compute';
import { DESIGNS } from '../../../../shared/vocabulary/designs';
import { MODALITIES } from '../../../../shared/vocabulary/modalities';
import { OUTCOME_KINDS } from '../../../../shared/vocabulary/outcomes';
import { PARAMETERS, UNITS } from '../../../../shared/vocabulary/parameters';
import { POPULATIONS } from '../../../../shared/vocabulary/populations';
import { TASKS } from '../../../../shared/vocabulary/tasks';
import { Button } from '../../../components/ui/Button';
import { FieldError } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { fixed } from '../../../lib/format';
import { REPORTED_LABELS } from '../../../lib/reported-labels';
import { StateBadge } from '../../../components/ui/StateBadge';
import type { DiscrepancyRow as Row } from '../api/get-pair';
import { useResolveDiscrepancy } from '../api/resolve-discrepancy';
import { discrepancyFormSchema } from '../forms/discrepancy';

const CHOICES: Record<string, readonly string[]> = { design: DESIGNS, population: POPULATIONS, modality: MODALITIES, task: TASKS, outcome: OUTCOME_KINDS, parameter: PARAMETERS, unit: UNITS };
const NUMERIC = new Set(['n1', 'n2', 'standardMs']);

export function showValue(field: string, v: unknown): string {
  if (v == null) return '— (blank)';
  if (field === 'effect' && typeof v === 'object') {
    const e = v as { form?: string; reported?: Record<string, number>; effect?: number; variance?: number; metric?: string; assumedR?: number | null };
    const rep = Object.entries(e.reported ?? {}).map(([k, x]) => `${k} ${x}`).join(', ');
    return `${e.metric ?? '?'} ${fixed(e.effect, 3)} (variance ${fixed(e.variance, 4)}) from ${e.form ?? '?'}: ${rep}${e.assumedR != null ? `; r assumed ${e.assumedR}` : ''}`;
  }
  if (field === 'studies') return `${v} stud${v === 1 ? 'y' : 'ies'}`;
  if (field === 'effects') return `${v} effect${v === 1 ? '' : 's'}`;
  return String(v);
}

type VocabularyTerm = { term: string; label: string };

function OwnValue({ row, value, onChange, terms }: { row: Row; value: unknown; onChange: (v: unknown) => void; terms: VocabularyTerm[] }) {
  const cls = 'rounded border border-paper-edge bg-white px-2 py-1 text-sm';
  if (row.field === 'manipulation')
    return (
      <select aria-label="Own value" className={cls} value={String(value ?? '')} onChange={(e) => onChange(e.target.value || undefined)}>
        <option value="">— choose —</option>
        {terms.map((m) => (
          <option key={m.term} value={m.term}>
            {m.label}
          </option>
        ))}
      </select>
    );
  if (CHOICES[row.field])
    return (
      <select aria-label="Own value" className={cls} value={String(value ?? '')} onChange={(e) => onChange(e.target.value || undefined)}>
        <option value="">— choose —</option>
        {CHOICES[row.field].map((c) => (
          <option key={c}>{c}</option>
        ))}
      </select>
    );
  if (NUMERIC.has(row.field)) return <input aria-label="Own value" className={`${cls} text-right tabular-nums`} inputMode="decimal" value={value == null ? '' : String(value)} onChange={(e) => onChange(e.target.value === '' ? undefined : Number(e.target.value))} />;
  if (row.field === 'effect') {
    const v = (value ?? {}) as { form?: ReportForm; reported?: Reported; assumedR?: number };
    const attempt = v.form ? tryComputeReported(v.form, v.reported ?? {}, v.assumedR) : null;
    return (
      <div className="text-sm">
        <select aria-label="Reported as" className={cls} value={v.form ?? ''} onChange={(e) => onChange({ ...v, form: e.target.value || undefined })}>
          <option value="">— reported as —</option>
          {REPORT_FORMS.map((f) => (
            <option key={f} value={f}>
              {REPORT_FORM_LABELS[f]}
            </option>
          ))}
        </select>
        <div className="mt-1 grid grid-cols-3 gap-1">
          {(v.form ? REPORT_FIELDS[v.form] : []).map((k) => (
            <label key={k} className="text-xs">
              {REPORTED_LABELS[k]}
              <input
                className={`${cls} w-full text-right tabular-nums`}
                inputMode="decimal"
                value={v.reported?.[k] ?? ''}
                onChange={(e) => onChange({ ...v, reported: { ...(v.reported ?? {}), [k]: e.target.value === '' ? undefined : Number(e.target.value) } })}
              />
            </label>
          ))}
        </div>
        <p className="mt-1 text-xs tabular-nums">{attempt ? (attempt.ok ? `✓ ${attempt.result!.metric} ${fixed(attempt.result!.effect, 3)}, variance ${fixed(attempt.result!.variance, 4)}` : `… ${attempt.error}`) : ''}</p>
      </div>
    );
  }
  return <input aria-label="Own value" className={cls} value={String(value ?? '')} onChange={(e) => onChange(e.target.value || undefined)} />;
}

type DecisionValues = { resolution: 'a' | 'b' | 'value'; value: unknown; rationale: string };

/** One discrepancy: both coders' values and the curator's decision with a rationale. */
export function DiscrepancyRow({ row, assignmentId, coders, editable, terms }: { row: Row; assignmentId: number; coders: [string, string]; editable: boolean; terms: VocabularyTerm[] }) {
  const resolve = useResolveDiscrepancy(assignmentId);
  const form = useForm<DecisionValues, unknown, z.output<typeof resolveDiscrepancySchema>>({
    resolver: formResolver(discrepancyFormSchema),
    defaultValues: { resolution: row.resolution ?? 'a', value: row.field === 'effect' ? row.valueA : (row.valueA ?? undefined), rationale: row.rationale ?? '' },
  });
  const { errors } = form.formState;
  const choice = useWatch({ control: form.control, name: 'resolution' });
  const structural = row.field === 'studies' || row.field === 'effects';
  const rationaleId = `d${row.id}-rationale`;
  return (
    <tr className="align-top" data-testid={`discrepancy-${row.id}`}>
      <td>
        <strong>{row.label}</strong>
        <div className="mt-1">
          <StateBadge state={row.status === 'resolved' ? 'settled' : 'disputed'} /> {row.status === 'resolved' ? `resolved by @${row.resolvedBy}` : 'open'}
        </div>
      </td>
      <td className="text-sm">{showValue(row.field, row.valueA)}</td>
      <td className="text-sm">{showValue(row.field, row.valueB)}</td>
      <td className="min-w-80">
        {editable ? (
          <form
            noValidate
            onSubmit={form.handleSubmit((decision) =>
              resolve.mutate({ assignmentId, id: row.id, ...decision }, { onError: (err) => showServerErrors(err, form.setError, ['resolution', 'value', 'rationale']) }),
            )}
          >
            <fieldset>
              <legend className="sr-only">Decision for {row.label}</legend>
              <label className="mr-3 text-sm">
                <input type="radio" value="a" {...form.register('resolution')} /> Take @{coders[0]}
              </label>
              <label className="mr-3 text-sm">
                <input type="radio" value="b" {...form.register('resolution')} /> Take @{coders[1]}
              </label>
              {!structural && (
                <label className="text-sm">
                  <input type="radio" value="value" {...form.register('resolution')} /> Enter a value
                </label>
              )}
            </fieldset>
            {choice === 'value' && (
              <>
                <Controller control={form.control} name="value" render={({ field }) => <OwnValue row={row} value={field.value} onChange={field.onChange} terms={terms} />} />
                <FieldError message={errors.value?.message} />
              </>
            )}
            <label className="mt-1 block text-xs font-semibold text-ink-soft">
              Rationale
              <textarea
                className="block w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm font-normal"
                rows={2}
                {...form.register('rationale')}
                aria-invalid={!!errors.rationale}
                aria-describedby={rationaleId}
              />
            </label>
            <FieldError id={rationaleId} message={errors.rationale?.message} />
            <Button type="submit" className="mt-1" disabled={resolve.isPending}>
              {row.status === 'resolved' ? 'Change decision' : 'Save decision'}
            </Button>
            {resolve.isSuccess && <span className="ml-2 text-xs">✓ Saved</span>}
            {errors.root?.server && <ErrorNote error={errors.root.server.message} />}
            {resolve.error && !Object.keys(errors).length && <ErrorNote error={resolve.error} />}
          </form>
        ) : (
          <p className="text-sm">
            {row.resolution ? `${row.resolution === 'value' ? 'own value' : `took @${coders[row.resolution === 'a' ? 0 : 1]}`}: ${row.rationale}` : '—'}
          </p>
        )}
      </td>
    </tr>
  );
}
