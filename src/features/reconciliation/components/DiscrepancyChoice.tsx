import { Controller, useFormContext, useWatch } from 'react-hook-form';
import type { ImpliedEffect } from '../../../../shared/schemas/reconciliation';
import { REPORT_FIELDS, REPORT_FORMS, REPORT_FORM_LABELS, tryComputeReported, type ReportForm, type Reported } from '../../../../shared/extraction/compute';
import { DESIGNS } from '../../../../shared/vocabulary/designs';
import { MODALITIES } from '../../../../shared/vocabulary/modalities';
import { OUTCOME_KINDS } from '../../../../shared/vocabulary/outcomes';
import { PARAMETERS, UNITS } from '../../../../shared/vocabulary/parameters';
import { POPULATIONS } from '../../../../shared/vocabulary/populations';
import { TASKS } from '../../../../shared/vocabulary/tasks';
import { FieldError } from '../../../components/ui/Field';
import { fixed } from '../../../lib/format';
import { REPORTED_LABELS } from '../../../lib/reported-labels';
import { StateBadge } from '../../../components/ui/StateBadge';
import type { DiscrepancyRow as Row } from '../api/get-pair';
import type { ReconcileValues } from '../forms/reconcile';

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

const EMPTY_EFFECT: ImpliedEffect[] = [];

/** The effects one coding gives where the field sits. */
function Implied({ effects, who }: { effects: ImpliedEffect[]; who: string }) {
  if (!effects.length) return <p className="mt-1 text-xs text-ink-soft">No effect coded here by {who}.</p>;
  return (
    <ul className="mt-1 text-xs tabular-nums" aria-label={`Effect this coding by ${who} gives`}>
      {effects.map((e) => (
        <li key={e.label}>
          {e.label}: {e.effect == null ? 'not computable' : `${e.metric ?? '?'} ${fixed(e.effect, 3)}, variance ${fixed(e.variance, 4)}`}
        </li>
      ))}
    </ul>
  );
}

/**
 * One differing field inside the reconciliation form: both coders' values side by side with the effect each coding
 * gives, nothing chosen until the curator takes a side or enters a value; an optional note of its own.
 */
export function DiscrepancyChoice({ row, index, coders, editable, terms }: { row: Row; index: number; coders: [string, string]; editable: boolean; terms: VocabularyTerm[] }) {
  const form = useFormContext<ReconcileValues>();
  const choice = useWatch({ control: form.control, name: `decisions.${index}.resolution` });
  const errors = form.formState.errors.decisions?.[index];
  const structural = row.field === 'studies' || row.field === 'effects';
  const errorId = `d${row.id}-choice`;
  const side = (key: 'a' | 'b', coder: string, value: unknown, implied: ImpliedEffect[]) => (
    <label className={`block rounded border px-2 py-1.5 ${choice === key ? 'border-action bg-action-light' : 'border-paper-edge bg-white'}`}>
      <span className="text-sm font-semibold">
        <input type="radio" value={key} disabled={!editable} {...form.register(`decisions.${index}.resolution`)} aria-describedby={errorId} /> Take @{coder} ({key.toUpperCase()})
      </span>
      <span className="mt-1 block text-sm" data-testid={`value-${key}`}>
        {showValue(row.field, value)}
      </span>
      <Implied effects={implied ?? EMPTY_EFFECT} who={`@${coder}`} />
    </label>
  );
  return (
    <fieldset className="mb-3 min-w-0 rounded border-l-4 border-caution bg-caution-light/40 px-3 py-2" data-testid={`discrepancy-${row.id}`} aria-invalid={!!errors?.resolution}>
      <legend className="sr-only">Decision for {row.label}</legend>
      <p className="text-sm">
        <strong>
          <span aria-hidden>≠ </span>
          {row.label}
        </strong>{' '}
        <StateBadge state={row.status === 'resolved' ? 'settled' : 'disputed'} /> {row.status === 'resolved' ? `decided by @${row.resolvedBy}` : 'the coders differ'}
      </p>
      <div className="mt-1 grid grid-cols-1 gap-2 sm:grid-cols-2">
        {side('a', coders[0], row.valueA, row.impliedA)}
        {side('b', coders[1], row.valueB, row.impliedB)}
      </div>
      {!structural && (
        <label className="mt-1 inline-block text-sm">
          <input type="radio" value="value" disabled={!editable} {...form.register(`decisions.${index}.resolution`)} aria-describedby={errorId} /> Enter a value
        </label>
      )}
      <FieldError id={errorId} message={errors?.resolution?.message} />
      {choice === 'value' && (
        <div className="mt-1">
          <Controller control={form.control} name={`decisions.${index}.value`} render={({ field }) => <OwnValue row={row} value={field.value} onChange={field.onChange} terms={terms} />} />
          <FieldError message={errors?.value?.message} />
        </div>
      )}
      {editable ? (
        <label className="mt-1 block text-xs font-semibold text-ink-soft">
          Note on this field (optional; the rationale below stands for it otherwise)
          <input className="block w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm font-normal" {...form.register(`decisions.${index}.note`)} />
        </label>
      ) : (
        row.rationale && <p className="mt-1 text-sm">{row.resolution === 'value' ? 'own value' : `took @${coders[row.resolution === 'b' ? 1 : 0]}`}: {row.rationale}</p>
      )}
    </fieldset>
  );
}
