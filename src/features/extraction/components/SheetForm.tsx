import { useCallback, useEffect, useRef, useState, type ReactNode } from 'react';
import { useFieldArray, useForm, useWatch, type Control, type FieldErrors, type UseFormRegister } from 'react-hook-form';
import { DEFAULT_ASSUMED_R, REPORT_FIELDS, REPORT_FORMS, REPORT_FORM_LABELS, tryComputeReported, type Reported } from '../../../../shared/extraction/compute';
import { effectWarnings, studyWarnings } from '../../../../shared/extraction/warnings';
import { orientAttempt } from '../../../../shared/extraction/orientation';
import { effectDraftSchema, sheetDraftSchema, sheetSubmitSchema, studyDraftSchema, type Sheet } from '../../../../shared/schemas/extraction';
import { DESIGNS, DESIGN_LABELS } from '../../../../shared/vocabulary/designs';
import { MODALITIES, MODALITY_LABELS } from '../../../../shared/vocabulary/modalities';
import { OUTCOMES, OUTCOME_KINDS, METRIC_LABELS } from '../../../../shared/vocabulary/outcomes';
import { OUTCOME_PARAMETERS, PARAMETERS, PARAMETER_LABELS, PARAMETER_UNITS, SIGN_CONVENTIONS, UNITS, UNIT_LABELS, effectQuantity, type QuantityChoice } from '../../../../shared/vocabulary/parameters';
import { POPULATIONS, POPULATION_LABELS } from '../../../../shared/vocabulary/populations';
import { TASKS, TASK_LABELS } from '../../../../shared/vocabulary/tasks';
import { Button } from '../../../components/ui/Button';
import { Field, messageAt } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { fieldInWords } from '../../../lib/forms/plain-words';
import type { z } from 'zod';
import { ApiRequestError } from '../../../lib/api-client';
import { useSaveExtraction } from '../api/save-extraction';
import { useSubmitExtraction } from '../api/submit-extraction';
import type { ExtractionDetail, StoredStudy } from '../api/types';
import { CsvImport } from './CsvImport';
import { EffectResult } from './EffectResult';
import { inSheetWords, REPORTED_LABELS } from '../../../lib/reported-labels';

export function toFormSheet(studies: StoredStudy[], notes: string): Sheet {
  return sheetDraftSchema.parse({
    notes,
    studies: studies.map(({ id: _id, studyId: _sid, effects, ...s }) => ({ ...s, effects: effects.map(({ id: _e, version: _v, computed: _c, withdrawnReason: _w, ...e }) => e) })),
  });
}

const emptyEffect = (): Sheet['studies'][number]['effects'][number] => ({ label: '', reported: {} });
const emptyStudy = (n: number): Sheet['studies'][number] => ({ label: `Experiment ${n}`, effects: [emptyEffect()] });

const inputCls = 'w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm aria-[invalid=true]:border-refusal';

const num = { setValueAs: (v: unknown) => (v === '' || v === null || v === undefined ? undefined : Number(v)) };
const txt = { setValueAs: (v: unknown) => (v === '' ? undefined : v) };

type VocabularyTerm = { term: string; label: string; retired: boolean };

interface Ctx {
  control: Control<Sheet>;
  register: UseFormRegister<Sheet>;
  errors: FieldErrors<Sheet>;
}

function EffectFields({ ctx, i, j, onRemove, terms }: { ctx: Ctx; i: number; j: number; onRemove: () => void; terms: VocabularyTerm[] }) {
  const { register, control, errors } = ctx;
  const p = `studies.${i}.effects.${j}` as const;
  const effect = useWatch({ control, name: p });
  const study = useWatch({ control, name: `studies.${i}` });
  const parsed = effectDraftSchema.safeParse(effect ?? {});
  const e = parsed.success ? parsed.data : undefined;
  const s = studyDraftSchema.safeParse(study ?? {});
  // in the outcome kind's sign convention: reversed where a lower value means lengthening (the result says so)
  const computed = e?.form ? orientAttempt(tryComputeReported(e.form, e.reported as Reported, e.assumedR), e, s.success ? s.data.task : undefined) : null;
  // the engine names fields by their keys (sd2); the sheet says its own labels (SD 2)
  const attempt = computed && !computed.ok && computed.error && e?.form ? { ...computed, error: inSheetWords(computed.error, REPORT_FIELDS[e.form]) } : computed;
  const warnings = e ? effectWarnings(e, s.success ? s.data : undefined, attempt?.ok ? attempt.result! : null) : [];
  const fields = e?.form ? REPORT_FIELDS[e.form] : [];
  const needsR = e?.form === 'smd_paired' || e?.form === 'log_ratio_paired';
  const metricMismatch = e?.outcome && attempt?.ok && !OUTCOMES[e.outcome].metrics.includes(attempt.result!.metric);
  // blank parameter or unit: the outcome kind's usual ones, said in the blank option
  const usual = e?.outcome ? effectQuantity({ outcome: e.outcome, parameter: e.parameter, form: e.form }) : null;
  const allowed: readonly string[] = e?.outcome ? OUTCOME_PARAMETERS[e.outcome] : [];
  return (
    <fieldset className="mt-3 rounded border border-paper-edge p-3" aria-label={`Study ${i + 1}, effect ${j + 1}`}>
      <legend className="px-1 text-sm font-semibold">Effect {j + 1}</legend>
      <div className="grid grid-cols-1 gap-2 md:grid-cols-4">
        <Field label="Label (what was contrasted)" error={messageAt(errors, `${p}.label`)}>
          <input className={inputCls} {...register(`${p}.label`)} placeholder="e.g. bright vs dim" />
        </Field>
        <Field label="Outcome kind" error={messageAt(errors, `${p}.outcome`)} hint={e?.outcome ? `Sign: ${SIGN_CONVENTIONS[e.outcome]}` : undefined}>
          <select className={inputCls} {...register(`${p}.outcome`, txt)} aria-invalid={!!messageAt(errors, `${p}.outcome`)}>
            <option value="">— choose —</option>
            {OUTCOME_KINDS.map((k) => (
              <option key={k} value={k}>
                {OUTCOMES[k].label}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Parameter (what was measured)" error={messageAt(errors, `${p}.parameter`)}>
          <select className={inputCls} {...register(`${p}.parameter`, txt)} aria-invalid={!!messageAt(errors, `${p}.parameter`)}>
            <option value="">{usual && !e?.parameter ? `usual: ${PARAMETER_LABELS[usual.parameter]}` : '— usual for the outcome kind —'}</option>
            {allowed.length > 0 && (
              <optgroup label={`For ${OUTCOMES[e!.outcome!].label.toLowerCase()}`}>
                {allowed.map((k) => (
                  <option key={k} value={k}>
                    {PARAMETER_LABELS[k as keyof typeof PARAMETER_LABELS]}
                  </option>
                ))}
              </optgroup>
            )}
            <optgroup label={allowed.length ? 'Of other outcome kinds' : 'Parameters'}>
              {PARAMETERS.filter((k) => !allowed.includes(k)).map((k) => (
                <option key={k} value={k}>
                  {PARAMETER_LABELS[k]}
                </option>
              ))}
            </optgroup>
          </select>
        </Field>
        <Field label="Unit" error={messageAt(errors, `${p}.unit`)} hint={usual ? `${PARAMETER_LABELS[usual.parameter]} is measured in ${PARAMETER_UNITS[usual.parameter].map((u) => UNIT_LABELS[u]).join(' or ')}` : undefined}>
          <select className={inputCls} {...register(`${p}.unit`, txt)} aria-invalid={!!messageAt(errors, `${p}.unit`)}>
            <option value="">{usual && !e?.unit ? `usual: ${UNIT_LABELS[usual.unit]}` : '— usual for the parameter —'}</option>
            {UNITS.map((u) => (
              <option key={u} value={u}>
                {UNIT_LABELS[u]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Manipulation" error={messageAt(errors, `${p}.manipulation`)}>
          <select className={inputCls} {...register(`${p}.manipulation`, txt)} aria-invalid={!!messageAt(errors, `${p}.manipulation`)}>
            <option value="">— choose —</option>
            {terms
              .filter((t) => !t.retired || t.term === e?.manipulation)
              .map((t) => (
                <option key={t.term} value={t.term}>
                  {t.label}
                  {t.retired ? ' (retired)' : ''}
                </option>
              ))}
          </select>
        </Field>
        <Field label="Reported as" error={messageAt(errors, `${p}.form`)} hint={e?.outcome ? `${OUTCOMES[e.outcome].label} is pooled as ${OUTCOMES[e.outcome].metrics.map((m) => METRIC_LABELS[m]).join(' or ')}` : undefined}>
          <select className={inputCls} {...register(`${p}.form`, txt)} aria-invalid={!!messageAt(errors, `${p}.form`)}>
            <option value="">— choose —</option>
            {REPORT_FORMS.map((f) => (
              <option key={f} value={f}>
                {REPORT_FORM_LABELS[f]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      {fields.length > 0 && (
        <div className="mt-2 grid grid-cols-2 gap-2 md:grid-cols-6">
          {fields.map((k) => (
            <Field key={k} label={REPORTED_LABELS[k]} error={messageAt(errors, `${p}.reported.${k}`) ?? (attempt && !attempt.ok && attempt.field === k ? attempt.error : undefined)}>
              <input className={`${inputCls} text-right tabular-nums`} inputMode="decimal" {...register(`${p}.reported.${k}` as any, num)} aria-invalid={!!messageAt(errors, `${p}.reported.${k}`)} />
            </Field>
          ))}
          {needsR && (
            <Field label="Assumed r if not reported" error={messageAt(errors, `${p}.assumedR`)} hint={`used only when r is blank; default ${DEFAULT_ASSUMED_R}`}>
              <input className={`${inputCls} text-right tabular-nums`} inputMode="decimal" placeholder={String(DEFAULT_ASSUMED_R)} {...register(`${p}.assumedR`, num)} />
            </Field>
          )}
        </div>
      )}
      <EffectResult attempt={attempt} warnings={warnings} form={e?.form} />
      {metricMismatch && (
        <p className="mt-1 text-xs text-refusal" role="alert">
          ✕ {OUTCOMES[e!.outcome!].label} is not pooled as {METRIC_LABELS[attempt!.result!.metric]}; choose another form.
        </p>
      )}
      <div className="mt-2 grid grid-cols-1 gap-2 md:grid-cols-4">
        <Field label="Page" error={messageAt(errors, `${p}.page`)}>
          <input className={inputCls} {...register(`${p}.page`, txt)} />
        </Field>
        <Field label="Table or figure" error={messageAt(errors, `${p}.locator`)}>
          <input className={inputCls} {...register(`${p}.locator`, txt)} placeholder="e.g. Table 2" />
        </Field>
        <div className="md:col-span-2">
          <Field label="Short quote" error={messageAt(errors, `${p}.quote`)}>
            <input className={inputCls} {...register(`${p}.quote`, txt)} />
          </Field>
        </div>
      </div>
      <Button className="mt-2" onClick={onRemove}>
        Remove effect {j + 1}
      </Button>
    </fieldset>
  );
}

function StudyFields({ ctx, i, onRemove, terms }: { ctx: Ctx; i: number; onRemove: () => void; terms: VocabularyTerm[] }) {
  const { register, control, errors } = ctx;
  const effects = useFieldArray({ control, name: `studies.${i}.effects` });
  const p = `studies.${i}` as const;
  const study = useWatch({ control, name: p });
  const s = studyDraftSchema.safeParse(study ?? {});
  const warnings = s.success ? studyWarnings(s.data) : [];
  return (
    <section className="mt-4 rounded border border-paper-edge bg-paper-deep/40 p-3" aria-label={`Study ${i + 1}`}>
      <h3 className="text-base font-bold">Study {i + 1}</h3>
      <div className="grid grid-cols-2 gap-2 md:grid-cols-5">
        <Field label="Label" error={messageAt(errors, `${p}.label`)}>
          <input className={inputCls} {...register(`${p}.label`)} />
        </Field>
        <Field label="Design" error={messageAt(errors, `${p}.design`)}>
          <select className={inputCls} {...register(`${p}.design`, txt)} aria-invalid={!!messageAt(errors, `${p}.design`)}>
            <option value="">— choose —</option>
            {DESIGNS.map((d) => (
              <option key={d} value={d}>
                {DESIGN_LABELS[d]}
              </option>
            ))}
          </select>
        </Field>
        <Field label={study?.design === 'between' ? 'n, group 1' : 'n (participants)'} error={messageAt(errors, `${p}.n1`)}>
          <input className={`${inputCls} text-right tabular-nums`} inputMode="numeric" {...register(`${p}.n1`, num)} aria-invalid={!!messageAt(errors, `${p}.n1`)} />
        </Field>
        {study?.design === 'between' && (
          <Field label="n, group 2" error={messageAt(errors, `${p}.n2`)}>
            <input className={`${inputCls} text-right tabular-nums`} inputMode="numeric" {...register(`${p}.n2`, num)} />
          </Field>
        )}
        <Field label="Standard duration (ms)" error={messageAt(errors, `${p}.standardMs`)}>
          <input className={`${inputCls} text-right tabular-nums`} inputMode="decimal" {...register(`${p}.standardMs`, num)} />
        </Field>
        <Field label="Population" error={messageAt(errors, `${p}.population`)}>
          <select className={inputCls} {...register(`${p}.population`, txt)} aria-invalid={!!messageAt(errors, `${p}.population`)}>
            <option value="">— choose —</option>
            {POPULATIONS.map((d) => (
              <option key={d} value={d}>
                {POPULATION_LABELS[d]}
              </option>
            ))}
          </select>
        </Field>
        {study?.population === 'clinical' && (
          <Field label="Diagnosis" error={messageAt(errors, `${p}.diagnosis`)}>
            <input className={inputCls} {...register(`${p}.diagnosis`, txt)} />
          </Field>
        )}
        <Field label="Modality" error={messageAt(errors, `${p}.modality`)}>
          <select className={inputCls} {...register(`${p}.modality`, txt)} aria-invalid={!!messageAt(errors, `${p}.modality`)}>
            <option value="">— choose —</option>
            {MODALITIES.map((d) => (
              <option key={d} value={d}>
                {MODALITY_LABELS[d]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Task" error={messageAt(errors, `${p}.task`)}>
          <select className={inputCls} {...register(`${p}.task`, txt)} aria-invalid={!!messageAt(errors, `${p}.task`)}>
            <option value="">— choose —</option>
            {TASKS.map((d) => (
              <option key={d} value={d}>
                {TASK_LABELS[d]}
              </option>
            ))}
          </select>
        </Field>
      </div>
      {warnings.map((w) => (
        <p key={w.field} className="mt-1 text-xs text-caution-dark">
          ⚠ Check ({w.field}): {w.message} <span className="text-ink-faint">(common practice)</span>
        </p>
      ))}
      {messageAt(errors, `${p}.effects`) && <p className="text-xs text-refusal">✕ {messageAt(errors, `${p}.effects`)}</p>}
      {effects.fields.map((f, j) => (
        <EffectFields key={f.id} ctx={ctx} i={i} j={j} onRemove={() => effects.remove(j)} terms={terms} />
      ))}
      <div className="mt-2 flex gap-2">
        <Button onClick={() => effects.append(emptyEffect())}>+ Add an effect to study {i + 1}</Button>
        <Button onClick={onRemove}>Remove study {i + 1}</Button>
      </div>
    </section>
  );
}

type SheetEffect = Sheet['studies'][number]['effects'][number];

/** What a panel beside the sheet (trial data) may do: read the studies' labels and add an effect. */
export interface SheetExtrasTarget {
  studies: string[];
  addEffect: (studyIndex: number | null, effect: SheetEffect, newStudy: { label: string; n1: number; modality: NonNullable<Sheet['studies'][number]['modality']>; task: NonNullable<Sheet['studies'][number]['task']> }) => void;
}

/** A 422 of the save: an effect whose parameter or unit its outcome kind does not allow, with the allowed ones. */
interface QuantityRefusal {
  effect: string;
  path: string;
  message: string;
  choices: QuantityChoice[];
}

type SaveState =
  | { kind: 'idle' }
  | { kind: 'saving' }
  | { kind: 'saved'; at: string }
  | { kind: 'invalid' }
  | { kind: 'conflict'; message: string }
  | { kind: 'refused'; message: string; problems: QuantityRefusal[] }
  | { kind: 'error'; message: string };

/** The extraction sheet: studies, effects, live effect sizes, autosave every couple of seconds, submit. */
export function SheetForm({
  detail,
  terms,
  onSubmitted,
  onReload,
  extras,
}: {
  detail: ExtractionDetail;
  /** The manipulation vocabulary, retired terms included. */
  terms: VocabularyTerm[];
  onSubmitted: (r: { state: string; discrepancies: number }) => void;
  onReload: () => void;
  /** panels drawn below the sheet that add effects to it */
  extras?: (target: SheetExtrasTarget) => ReactNode;
}) {
  const x = detail.extraction;
  const form = useForm<Sheet>({
    // The draft schema's inputs are loose (blank is "not reported"), so the form holds its output shape.
    resolver: formResolver(sheetDraftSchema as unknown as z.ZodType<Sheet, Sheet>),
    defaultValues: toFormSheet(detail.studies, x.notes),
    mode: 'onBlur',
  });
  const { control, register, formState, setError, clearErrors, getValues, reset, setValue } = form;
  const studies = useFieldArray({ control, name: 'studies' });
  const version = useRef(x.version);
  const lastSaved = useRef(JSON.stringify(getValues()));
  const [save, setSave] = useState<SaveState>({ kind: 'idle' });
  const saver = useSaveExtraction();
  const submitter = useSubmitExtraction();
  const values = useWatch({ control });

  const flush = useCallback(async (): Promise<boolean> => {
    const raw = getValues();
    const snapshot = JSON.stringify(raw);
    if (snapshot === lastSaved.current) return true;
    const parsed = sheetDraftSchema.safeParse(raw);
    if (!parsed.success) {
      setSave({ kind: 'invalid' });
      await form.trigger();
      return false;
    }
    setSave({ kind: 'saving' });
    try {
      const res = await saver.mutateAsync({ id: x.id, version: version.current, sheet: parsed.data });
      version.current = res.version;
      lastSaved.current = snapshot;
      setSave({ kind: 'saved', at: new Date(res.updatedAt).toLocaleTimeString() });
      return true;
    } catch (err) {
      const problems = err instanceof ApiRequestError && err.status === 422 ? (err.details as { problems?: QuantityRefusal[] } | undefined)?.problems : undefined;
      if (err instanceof ApiRequestError && err.status === 409) setSave({ kind: 'conflict', message: err.message });
      else if (problems?.length) {
        for (const pr of problems) setError(pr.path.replace(/^body\.sheet\./, '') as any, { message: pr.message });
        setSave({ kind: 'refused', message: (err as Error).message, problems });
      }
      else if (err instanceof ApiRequestError && err.status === 400) {
        for (const [path, message] of Object.entries(err.fieldErrors())) setError(path.replace(/^sheet\./, '') as any, { message });
        setSave({ kind: 'invalid' });
      } else setSave({ kind: 'error', message: (err as Error).message });
      return false;
    }
  }, [getValues, saver, x.id, setError, form]);

  // Autosave: two seconds after the last change.
  useEffect(() => {
    if (save.kind === 'conflict') return;
    const timer = setTimeout(() => void flush(), 2000);
    return () => clearTimeout(timer);
  }, [values, flush, save.kind]);

  async function submit() {
    clearErrors();
    const complete = sheetSubmitSchema.safeParse(getValues());
    if (!complete.success) {
      for (const issue of complete.error.issues) setError(issue.path.join('.') as any, { message: issue.message });
      const first = complete.error.issues[0];
      setSave({ kind: 'error', message: `Not ready to submit: ${first.path.length ? fieldInWords(first.path) : 'the sheet'} — ${first.message}${complete.error.issues.length > 1 ? ` (and ${complete.error.issues.length - 1} more, marked below)` : ''}` });
      return;
    }
    if (!(await flush())) return;
    try {
      const res = await submitter.mutateAsync({ id: x.id, version: version.current });
      onSubmitted(res);
    } catch (err) {
      if (err instanceof ApiRequestError) {
        for (const [path, message] of Object.entries(err.fieldErrors())) setError(path as any, { message });
        setSave({ kind: err.status === 409 ? 'conflict' : 'error', message: err.message });
      } else throw err;
    }
  }

  const addEffect = useCallback<SheetExtrasTarget['addEffect']>(
    (at, effect, newStudy) => {
      const next = structuredClone(getValues());
      if (at !== null && next.studies[at]) next.studies[at].effects.push(effect);
      else next.studies.push({ label: newStudy.label, design: 'within', n1: newStudy.n1, modality: newStudy.modality, task: newStudy.task, effects: [effect] });
      reset(next, { keepDefaultValues: true });
    },
    [getValues, reset],
  );

  const ctx: Ctx = { control, register, errors: formState.errors };
  const studyLabels = (values.studies ?? []).map((s) => s?.label ?? '');
  return (
    <>
      <form
        onSubmit={(e) => {
          e.preventDefault();
          void submit();
        }}
        noValidate
        aria-label="Extraction sheet"
      >
        <div className="sticky top-0 z-10 -mx-1 mb-2 flex flex-wrap items-center gap-3 border-b border-paper-edge bg-paper px-1 py-2 text-sm">
          <span role="status" data-testid="save-state">
            {save.kind === 'idle' && 'Draft — changes save by themselves.'}
            {save.kind === 'saving' && '… Saving'}
            {save.kind === 'saved' && `✓ Saved at ${save.at}`}
            {save.kind === 'invalid' && <span className="text-refusal">✕ Not saved: fix the marked fields.</span>}
          </span>
          <Button onClick={() => void flush()}>Save now</Button>
          {x.kind === 'coding' && (
            <Button variant="primary" type="submit" disabled={submitter.isPending}>
              {submitter.isPending ? 'Submitting…' : 'Submit for comparison'}
            </Button>
          )}
        </div>
        {save.kind === 'conflict' && (
          <div role="alert" className="my-2 rounded border-l-4 border-refusal bg-refusal-light px-3 py-2 text-sm text-refusal">
            <strong>✕ Not saved:</strong> {save.message}{' '}
            <Button
              onClick={() => {
                reset();
                onReload();
              }}
            >
              Reload the sheet
            </Button>
          </div>
        )}
        {save.kind === 'error' && <ErrorNote error={save.message} />}
        {save.kind === 'refused' && (
          <div role="alert" className="my-2 rounded border-l-4 border-refusal bg-refusal-light px-3 py-2 text-sm text-refusal">
            <strong>✕ Not saved:</strong>
            {save.problems.map((pr) => (
              <div key={pr.path} className="mt-1 flex flex-wrap items-center gap-2 text-ink" role="group" aria-label={`Choices for ${pr.message.split(':')[0]}`}>
                <span>{pr.message}. Choose:</span>
                {pr.choices.map((c) => (
                  <Button
                    key={c.label}
                    onClick={() => {
                      for (const [k, v] of Object.entries(c.set)) setValue(`${pr.effect}.${k}` as any, v, { shouldDirty: true });
                      clearErrors();
                      void flush();
                    }}
                  >
                    {c.label}
                  </Button>
                ))}
              </div>
            ))}
          </div>
        )}
        {messageAt(formState.errors, 'studies') && <p className="text-sm text-refusal">✕ {messageAt(formState.errors, 'studies')}</p>}
        {studies.fields.length === 0 && <p className="my-3 text-ink-soft">No studies yet. Add the first experiment of the paper, or paste rows from a spreadsheet below.</p>}
        {studies.fields.map((f, i) => (
          <StudyFields key={f.id} ctx={ctx} i={i} onRemove={() => studies.remove(i)} terms={terms} />
        ))}
        <div className="mt-3 flex gap-2">
          <Button onClick={() => studies.append(emptyStudy(studies.fields.length + 1))}>+ Add a study</Button>
        </div>
        <label className="mt-4 block text-sm">
          <span className="block text-xs font-semibold text-ink-soft">Notes for the curator</span>
          <textarea className={inputCls} rows={2} {...register('notes')} />
        </label>
        <CsvImport
          onRows={(rows) => {
            const current = getValues();
            const next = structuredClone(current);
            for (const r of rows) {
              const at = next.studies.findIndex((s) => s.label === r.study.label);
              if (at >= 0) next.studies[at].effects.push(r.effect);
              else next.studies.push({ ...r.study, effects: [r.effect] });
            }
            reset(next, { keepDefaultValues: true });
          }}
        />
      </form>
      {extras?.({ studies: studyLabels, addEffect })}
    </>
  );
}
