import type { FormEvent, ReactNode } from 'react';
import { METHOD_LABELS, MODERATOR_LABELS, ONE_PER_STUDY_LABELS, ONE_PER_STUDY_RULES, SUBGROUP_VARIABLES } from '../../../../shared/schemas/synthesis';
import { Button } from '../../../components/ui/Button';
import type { SynthesisFacets, Facet } from '../api/get-facets';
import { valueLabel } from '../labels';
import type { SynthesisForm } from '../url-state';

function Field({ id, label, error, hint, children }: { id: string; label: string; error?: string; hint?: string; children: ReactNode }) {
  return (
    <div className="flex min-w-40 flex-col gap-0.5 text-sm">
      <label htmlFor={id} className="font-semibold">
        {label}
      </label>
      {children}
      {hint && !error && <span className="text-xs text-ink-faint">{hint}</span>}
      {error && (
        <span id={`${id}-error`} className="text-xs text-refusal">
          ✕ {error}
        </span>
      )}
    </div>
  );
}

const inputClass = (error?: string) => `rounded border bg-white/70 px-2 py-1 ${error ? 'border-refusal' : 'border-paper-edge'}`;

function FacetSelect({ id, value, facets, onChange, kind, error }: { id: string; value: string; facets: Facet[]; onChange: (v: string) => void; kind: string; error?: string }) {
  return (
    <select id={id} value={value} onChange={(e) => onChange(e.target.value)} className={inputClass(error)} aria-invalid={!!error} aria-describedby={error ? `${id}-error` : undefined}>
      <option value="">Any</option>
      {facets.map((f) => (
        <option key={f.value} value={f.value}>
          {f.label ?? valueLabel(kind, f.value)} ({f.count})
        </option>
      ))}
    </select>
  );
}

/** Filters over settled effects and the analysis options, checked with the server's own schema. */
export function SynthesisFormPanel({
  form,
  onChange,
  onSubmit,
  facets,
  errors,
  running,
}: {
  form: SynthesisForm;
  onChange: (f: SynthesisForm) => void;
  onSubmit: () => void;
  facets: SynthesisFacets | undefined;
  errors: Record<string, string>;
  running: boolean;
}) {
  const set = <K extends keyof SynthesisForm>(k: K, v: SynthesisForm[K]) => onChange({ ...form, [k]: v });
  const submit = (e: FormEvent) => {
    e.preventDefault();
    onSubmit();
  };
  const f = facets;
  return (
    <form onSubmit={submit} noValidate aria-label="Synthesis filters and options" className="rounded border border-paper-edge bg-paper-deep/50 p-3">
      <fieldset className="flex flex-wrap gap-3">
        <legend className="mb-1 font-reading font-bold">Which settled effects</legend>
        <Field id="f-manipulation" label="Manipulation" error={errors.manipulation} hint="Ctrl/⌘-click for several">
          <select
            id="f-manipulation"
            multiple
            size={4}
            value={form.manipulation}
            onChange={(e) => set('manipulation', [...e.target.selectedOptions].map((o) => o.value))}
            className={inputClass(errors.manipulation)}
          >
            {(f?.manipulations ?? []).map((m) => (
              <option key={m.value} value={m.value}>
                {m.label} ({m.count})
              </option>
            ))}
          </select>
        </Field>
        <Field id="f-outcome" label="Outcome kind" error={errors.outcome}>
          <FacetSelect id="f-outcome" kind="outcome" value={form.outcome} facets={f?.outcomes ?? []} onChange={(v) => set('outcome', v)} error={errors.outcome} />
        </Field>
        <Field id="f-metric" label="Metric" error={errors.metric} hint="Different metrics are never pooled together">
          <FacetSelect id="f-metric" kind="metric" value={form.metric} facets={f?.metrics ?? []} onChange={(v) => set('metric', v)} error={errors.metric} />
        </Field>
        <Field id="f-population" label="Population" error={errors.population}>
          <FacetSelect id="f-population" kind="population" value={form.population} facets={f?.populations ?? []} onChange={(v) => set('population', v)} />
        </Field>
        <Field id="f-modality" label="Modality" error={errors.modality}>
          <FacetSelect id="f-modality" kind="modality" value={form.modality} facets={f?.modalities ?? []} onChange={(v) => set('modality', v)} />
        </Field>
        <Field id="f-task" label="Task" error={errors.task}>
          <FacetSelect id="f-task" kind="task" value={form.task} facets={f?.tasks ?? []} onChange={(v) => set('task', v)} />
        </Field>
        <Field id="f-design" label="Design" error={errors.design}>
          <FacetSelect id="f-design" kind="design" value={form.design} facets={f?.designs ?? []} onChange={(v) => set('design', v)} />
        </Field>
        <Field id="f-yearFrom" label="From year" error={errors.yearFrom} hint={f?.years ? `earliest ${f.years.min}` : undefined}>
          <input id="f-yearFrom" inputMode="numeric" value={form.yearFrom} onChange={(e) => set('yearFrom', e.target.value)} className={`${inputClass(errors.yearFrom)} w-24`} aria-invalid={!!errors.yearFrom} aria-describedby={errors.yearFrom ? 'f-yearFrom-error' : undefined} />
        </Field>
        <Field id="f-yearTo" label="To year" error={errors.yearTo} hint={f?.years ? `latest ${f.years.max}` : undefined}>
          <input id="f-yearTo" inputMode="numeric" value={form.yearTo} onChange={(e) => set('yearTo', e.target.value)} className={`${inputClass(errors.yearTo)} w-24`} aria-invalid={!!errors.yearTo} aria-describedby={errors.yearTo ? 'f-yearTo-error' : undefined} />
        </Field>
      </fieldset>
      <fieldset className="mt-3 flex flex-wrap items-start gap-3">
        <legend className="mb-1 font-reading font-bold">How to pool</legend>
        <Field id="f-method" label="Estimator" error={errors.method}>
          <select id="f-method" value={form.method} onChange={(e) => set('method', e.target.value)} className={inputClass(errors.method)}>
            {(['DL', 'REML', 'PM', 'FE'] as const).map((m) => (
              <option key={m} value={m}>
                {METHOD_LABELS[m]}
              </option>
            ))}
          </select>
        </Field>
        <div className="flex flex-col gap-0.5 pt-5 text-sm">
          <label className="flex items-center gap-1.5">
            <input type="checkbox" checked={form.hksj} onChange={(e) => set('hksj', e.target.checked)} disabled={form.method === 'FE'} />
            Hartung–Knapp–Sidik–Jonkman
          </label>
        </div>
        <Field id="f-level" label="Confidence level" error={errors.level} hint="e.g. 0.95">
          <input id="f-level" inputMode="decimal" value={form.level} onChange={(e) => set('level', e.target.value)} className={`${inputClass(errors.level)} w-20`} aria-invalid={!!errors.level} aria-describedby={errors.level ? 'f-level-error' : undefined} />
        </Field>
        <Field id="f-dep" label="Several effects in one study" error={errors.rule}>
          <select id="f-dep" value={form.depMode} onChange={(e) => set('depMode', e.target.value as SynthesisForm['depMode'])} className={inputClass()}>
            <option value="aggregate">Combine with a stated correlation</option>
            <option value="one">Keep one per study</option>
          </select>
        </Field>
        {form.depMode === 'aggregate' ? (
          <Field id="f-r" label="Assumed correlation r" error={errors.r} hint="between 0 and 1; 0.5 by default">
            <input id="f-r" inputMode="decimal" value={form.r} onChange={(e) => set('r', e.target.value)} className={`${inputClass(errors.r)} w-20`} aria-invalid={!!errors.r} aria-describedby={errors.r ? 'f-r-error' : undefined} />
          </Field>
        ) : (
          <Field id="f-rule" label="Keep" error={errors.rule}>
            <select id="f-rule" value={form.rule} onChange={(e) => set('rule', e.target.value)} className={inputClass(errors.rule)}>
              {ONE_PER_STUDY_RULES.map((r) => (
                <option key={r} value={r}>
                  {ONE_PER_STUDY_LABELS[r]}
                </option>
              ))}
            </select>
          </Field>
        )}
        <Field id="f-subgroup" label="Subgroups by" error={errors.subgroup}>
          <select id="f-subgroup" value={form.subgroup} onChange={(e) => set('subgroup', e.target.value)} className={inputClass(errors.subgroup)}>
            <option value="">No subgroups</option>
            {SUBGROUP_VARIABLES.map((v) => (
              <option key={v} value={v}>
                {v}
              </option>
            ))}
          </select>
        </Field>
        <Field id="f-moderator" label="Meta-regression on" error={errors.moderator}>
          <select id="f-moderator" value={form.moderator} onChange={(e) => set('moderator', e.target.value)} className={inputClass(errors.moderator)}>
            <option value="">No moderator</option>
            {(Object.keys(MODERATOR_LABELS) as Array<keyof typeof MODERATOR_LABELS>).map((m) => (
              <option key={m} value={m}>
                {MODERATOR_LABELS[m]}
              </option>
            ))}
          </select>
        </Field>
      </fieldset>
      <div className="mt-3 flex items-center gap-3">
        <Button type="submit" variant="primary" disabled={running}>
          {running ? 'Pooling…' : 'Run synthesis'}
        </Button>
        {errors.form && <span className="text-sm text-refusal">✕ {errors.form}</span>}
      </div>
    </form>
  );
}
