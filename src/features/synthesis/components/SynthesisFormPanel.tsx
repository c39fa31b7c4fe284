import type { ReactElement } from 'react';
import { Controller, useWatch, type Control, type UseFormReturn } from 'react-hook-form';
import { METHOD_LABELS, MODERATOR_LABELS, ONE_PER_STUDY_LABELS, ONE_PER_STUDY_RULES, REGRESSION_MODERATORS, SUBGROUP_VARIABLES, type SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { Button } from '../../../components/ui/Button';
import { Field, FieldError, messageAt } from '../../../components/ui/Field';
import type { Facet, SynthesisFacets } from '../api/get-facets';
import type { SynthesisFormValues } from '../codec';
import { valueLabel } from '../labels';

export type SynthesisForm = UseFormReturn<SynthesisFormValues, unknown, SynthesisRequest>;
type FacetPath = 'filters.outcome' | 'filters.parameter' | 'filters.unit' | 'filters.metric' | 'filters.population' | 'filters.modality' | 'filters.task' | 'filters.design';

const inputClass = 'rounded border bg-white/70 px-2 py-1 border-paper-edge aria-[invalid=true]:border-refusal';

function SynthesisField({ label, error, hint, children }: { label: string; error?: string; hint?: string; children: ReactElement<Record<string, unknown>> }) {
  return (
    <Field label={label} error={error} hint={hint} className="flex min-w-40 flex-col gap-0.5 text-sm" labelClassName="font-semibold">
      {children}
    </Field>
  );
}

/** A filter over the values coded so far (their counts beside them); controlled, as the options arrive from the server. */
function FacetSelect({ control, name, facets, kind, ...rest }: { control: Control<SynthesisFormValues, unknown, SynthesisRequest>; name: FacetPath; facets: Facet[]; kind: string }) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field }) => (
        <select {...rest} {...field} className={inputClass}>
          <option value="">Any</option>
          {facets.map((f) => (
            <option key={f.value} value={f.value}>
              {f.label ?? valueLabel(kind, f.value)} ({f.count})
            </option>
          ))}
        </select>
      )}
    />
  );
}

/** Several manipulations may be chosen; controlled, as the options arrive from the server. */
function ManipulationSelect({ control, facets, ...rest }: { control: Control<SynthesisFormValues, unknown, SynthesisRequest>; facets: Facet[] }) {
  return (
    <Controller
      control={control}
      name="filters.manipulation"
      render={({ field }) => (
        <select
          {...rest}
          multiple
          size={4}
          name={field.name}
          ref={field.ref}
          onBlur={field.onBlur}
          value={field.value}
          onChange={(e) => field.onChange([...e.target.selectedOptions].map((o) => o.value))}
          className={inputClass}
        >
          {facets.map((m) => (
            <option key={m.value} value={m.value}>
              {m.label} ({m.count})
            </option>
          ))}
        </select>
      )}
    />
  );
}

/** Filters over settled effects and the analysis options, checked with the server's own schema. */
export function SynthesisFormPanel({ form, onRun, facets, running }: { form: SynthesisForm; onRun: (request: SynthesisRequest) => void; facets: SynthesisFacets | undefined; running: boolean }) {
  const { control, register, formState } = form;
  const err = (path: string) => messageAt(formState.errors, path);
  const method = useWatch({ control, name: 'method' });
  const mode = useWatch({ control, name: 'dependence.mode' });
  const subgroup = useWatch({ control, name: 'subgroup' });
  const f = facets;
  return (
    <form onSubmit={form.handleSubmit(onRun)} noValidate aria-label="Synthesis filters and options" className="rounded border border-paper-edge bg-paper-deep/50 p-3">
      <fieldset className="flex flex-wrap gap-3">
        <legend className="mb-1 font-reading font-bold">Which settled effects</legend>
        <SynthesisField label="Manipulation" error={err('filters.manipulation')} hint="Ctrl/⌘-click for several">
          <ManipulationSelect control={control} facets={f?.manipulations ?? []} />
        </SynthesisField>
        <SynthesisField label="Outcome kind" error={err('filters.outcome')}>
          <FacetSelect control={control} name="filters.outcome" kind="outcome" facets={f?.outcomes ?? []} />
        </SynthesisField>
        <SynthesisField label="Parameter" error={err('filters.parameter')} hint="What was measured (PSE, JND …)">
          <FacetSelect control={control} name="filters.parameter" kind="parameter" facets={f?.parameters ?? []} />
        </SynthesisField>
        <SynthesisField label="Unit" error={err('filters.unit')} hint="Different parameters or units are never pooled together">
          <FacetSelect control={control} name="filters.unit" kind="unit" facets={f?.units ?? []} />
        </SynthesisField>
        <SynthesisField label="Metric" error={err('filters.metric')} hint="Different metrics are never pooled together">
          <FacetSelect control={control} name="filters.metric" kind="metric" facets={f?.metrics ?? []} />
        </SynthesisField>
        <SynthesisField label="Standardized mean differences" error={err('smdFamily')} hint="g_z is never pooled with the others">
          <select {...register('smdFamily')} className={inputClass}>
            <option value="">each standardizer on its own</option>
            <option value="raw_score">g_s, g_av and g_rm together (raw-score)</option>
          </select>
        </SynthesisField>
        <SynthesisField label="Population" error={err('filters.population')}>
          <FacetSelect control={control} name="filters.population" kind="population" facets={f?.populations ?? []} />
        </SynthesisField>
        <SynthesisField label="Modality" error={err('filters.modality')}>
          <FacetSelect control={control} name="filters.modality" kind="modality" facets={f?.modalities ?? []} />
        </SynthesisField>
        <SynthesisField label="Task" error={err('filters.task')}>
          <FacetSelect control={control} name="filters.task" kind="task" facets={f?.tasks ?? []} />
        </SynthesisField>
        <SynthesisField label="Design" error={err('filters.design')}>
          <FacetSelect control={control} name="filters.design" kind="design" facets={f?.designs ?? []} />
        </SynthesisField>
        <div className="flex flex-col gap-0.5 pt-5 text-sm">
          <label className="flex items-center gap-1.5">
            <input type="checkbox" {...register('filters.excludeBound')} />
            Leave out effects computed from a bound (p &lt; …)
          </label>
          <label className="flex items-center gap-1.5">
            <input type="checkbox" {...register('filters.excludeApproximate')} />
            Leave out approximate effects (from medians)
          </label>
        </div>
        <SynthesisField label="From year" error={err('filters.yearFrom')} hint={f?.years ? `earliest ${f.years.min}` : undefined}>
          <input inputMode="numeric" {...register('filters.yearFrom')} className={`${inputClass} w-24`} />
        </SynthesisField>
        <SynthesisField label="To year" error={err('filters.yearTo')} hint={f?.years ? `latest ${f.years.max}` : undefined}>
          <input inputMode="numeric" {...register('filters.yearTo')} className={`${inputClass} w-24`} />
        </SynthesisField>
      </fieldset>
      <fieldset className="mt-3 flex flex-wrap items-start gap-3">
        <legend className="mb-1 font-reading font-bold">How to pool</legend>
        <SynthesisField label="Estimator" error={err('method')} hint={mode === 'multilevel' ? 'not used: the three-level model is fitted by REML' : undefined}>
          <select {...register('method')} className={inputClass}>
            {(['DL', 'REML', 'PM', 'FE'] as const).map((m) => (
              <option key={m} value={m}>
                {METHOD_LABELS[m]}
              </option>
            ))}
          </select>
        </SynthesisField>
        <div className="flex flex-col gap-0.5 pt-5 text-sm">
          <label className="flex items-center gap-1.5">
            <input type="checkbox" {...register('hksj')} disabled={method === 'FE'} />
            Hartung–Knapp–Sidik–Jonkman
          </label>
          <FieldError message={err('hksj')} />
        </div>
        <SynthesisField label="Confidence level" error={err('level')} hint="e.g. 0.95 for 95%">
          <input inputMode="decimal" {...register('level')} className={`${inputClass} w-20`} />
        </SynthesisField>
        <SynthesisField label="Several effects in one study" error={err('dependence.mode')}>
          <select {...register('dependence.mode')} className={inputClass}>
            <option value="multilevel">Three-level model: effects within papers (recommended)</option>
            <option value="aggregate">Combine with a stated correlation</option>
            <option value="one">Keep one per study</option>
          </select>
        </SynthesisField>
        {mode === 'multilevel' ? (
          <div className="flex flex-col gap-0.5 pt-5 text-sm">
            <label className="flex items-center gap-1.5">
              <input type="checkbox" {...register('dependence.robust')} />
              Robust variance (CR2, Satterthwaite df)
            </label>
            <FieldError message={err('dependence.robust')} />
          </div>
        ) : mode === 'one' ? (
          <SynthesisField label="Keep" error={err('dependence.rule')}>
            <select {...register('dependence.rule')} className={inputClass}>
              {ONE_PER_STUDY_RULES.map((r) => (
                <option key={r} value={r}>
                  {ONE_PER_STUDY_LABELS[r]}
                </option>
              ))}
            </select>
          </SynthesisField>
        ) : (
          <>
            <SynthesisField label="Assumed correlation r" error={err('dependence.r')} hint="between 0 and 1; 0.5 by default">
              <input inputMode="decimal" {...register('dependence.r')} className={`${inputClass} w-20`} />
            </SynthesisField>
            <div className="flex flex-col gap-0.5 pt-5 text-sm">
              <label className="flex items-center gap-1.5">
                <input type="checkbox" {...register('dependence.weighted')} />
                Inverse-variance composite
              </label>
              <FieldError message={err('dependence.weighted')} />
            </div>
          </>
        )}
        <SynthesisField label="Subgroups by" error={err('subgroup')}>
          <select {...register('subgroup')} className={inputClass}>
            <option value="">No subgroups</option>
            {SUBGROUP_VARIABLES.map((v) => (
              <option key={v} value={v}>
                {valueLabel('subgroup', v)}
              </option>
            ))}
          </select>
        </SynthesisField>
        <SynthesisField label="Between-study variance in subgroups" error={err('subgroupTau2')} hint={!subgroup ? 'choose subgroups first' : mode === 'multilevel' ? 'the three-level model fits each subgroup separately' : undefined}>
          <select {...register('subgroupTau2')} disabled={!subgroup} className={inputClass}>
            <option value="">{valueLabel('subgroupTau2', 'separate')}</option>
            <option value="pooled">{valueLabel('subgroupTau2', 'pooled')}</option>
          </select>
        </SynthesisField>
        <SynthesisField label="Meta-regression on" error={err('moderator')}>
          <select {...register('moderator')} className={inputClass}>
            <option value="">No moderator</option>
            {(Object.keys(MODERATOR_LABELS) as Array<keyof typeof MODERATOR_LABELS>).map((m) => (
              <option key={m} value={m}>
                {MODERATOR_LABELS[m]}
              </option>
            ))}
          </select>
        </SynthesisField>
        <fieldset className="flex flex-col gap-0.5 text-sm">
          <legend className="font-semibold">Meta-regression on several moderators</legend>
          <div className="flex flex-wrap gap-x-3">
            {REGRESSION_MODERATORS.map((m) => (
              <label key={m} className="flex items-center gap-1.5">
                <input type="checkbox" value={m} {...register('moderators')} />
                {valueLabel('moderator', m)}
              </label>
            ))}
          </div>
          <span className="text-xs text-ink-soft">{mode === 'multilevel' ? 'not fitted under the three-level model' : 'categories coded against their first value; Knapp–Hartung tests with HKSJ'}</span>
          <FieldError message={err('moderators')} />
        </fieldset>
      </fieldset>
      <div className="mt-3 flex items-center gap-3">
        <Button type="submit" variant="primary" disabled={running}>
          {running ? 'Pooling…' : 'Run synthesis'}
        </Button>
        <FieldError message={formState.errors.root?.server?.message} className="text-sm text-refusal" />
      </div>
    </form>
  );
}
