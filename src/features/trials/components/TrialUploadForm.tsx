import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { PSYCHOMETRIC_MODELS } from '../../../../shared/psychophysics/psychometric';
import { startFitsSchema, trialUploadSchema } from '../../../../shared/schemas/trials';
import { TRIAL_TASKS, TRIAL_TASK_LABELS } from '../../../../shared/trials/fits';
import { COUNT_COLUMNS, TRIAL_COLUMNS, TRIAL_UPLOAD_MAX_BYTES } from '../../../../shared/trials/csv';
import { MODALITIES, MODALITY_LABELS } from '../../../../shared/vocabulary/modalities';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { ApiRequestError } from '../../../lib/api-client';
import { formResolver } from '../../../lib/forms/resolver';
import { useStartFits } from '../api/start-fits';
import { useUploadTrialSet } from '../api/upload-trial-set';

const MODEL_LABELS: Record<(typeof PSYCHOMETRIC_MODELS)[number], string> = { cumulative_gaussian: 'Cumulative Gaussian (probit)', logistic: 'Logistic' };
const MB = TRIAL_UPLOAD_MAX_BYTES / 1024 / 1024;

// The upload's own fields and the fits' resamples, as the two routes check them.
const uploadFormSchema = trialUploadSchema.extend({ resamples: startFitsSchema.shape.resamples });

const inputCls = 'w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm aria-[invalid=true]:border-refusal';

type Refusal = { message: string; lines: string[] };

/** Upload a CSV of trials (or counts per level) and start its fits; a refused file lists its bad rows in words. */
export function TrialUploadForm({ extractionId }: { extractionId: number }) {
  const form = useForm({
    resolver: formResolver(uploadFormSchema),
    defaultValues: { label: '', task: 'order', modality: 'audiovisual', model: 'cumulative_gaussian', resamples: 1000 },
  });
  const { register, handleSubmit, formState, control, reset } = form;
  const task = useWatch({ control, name: 'task' });
  const [file, setFile] = useState<File | null>(null);
  const [fileError, setFileError] = useState<string | null>(null);
  const [refusal, setRefusal] = useState<Refusal | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const uploader = useUploadTrialSet();
  const starter = useStartFits();

  const submit = handleSubmit(async (v) => {
    setRefusal(null);
    setDone(null);
    if (!file) return setFileError('choose a CSV file of trials or counts');
    if (file.size > TRIAL_UPLOAD_MAX_BYTES) return setFileError(`the file is larger than ${MB} MB; split it into several data sets`);
    try {
      const set = await uploader.mutateAsync({ extractionId, file, label: v.label, task: v.task, modality: v.modality, model: v.model });
      await starter.mutateAsync({ setId: set.id, resamples: v.resamples });
      setDone(`"${set.label}": ${set.participants} participants, ${set.conditions.length} conditions, ${set.trials.toLocaleString('en')} trials. The fits have started.`);
      reset({ ...v, label: '' });
      setFile(null);
    } catch (err) {
      if (err instanceof ApiRequestError) {
        const lines = Array.isArray(err.details) ? (err.details as { message?: string }[]).map((d) => d.message ?? '').filter(Boolean) : [];
        setRefusal({ message: err.message, lines });
      } else setRefusal({ message: (err as Error).message, lines: [] });
    }
  });

  const busy = uploader.isPending || starter.isPending;
  return (
    <form onSubmit={(e) => void submit(e)} noValidate aria-label="Upload trial data" className="mt-2 rounded border border-paper-edge bg-white/50 p-3">
      <p className="text-xs text-ink-soft">
        A CSV with a header row: <code>{TRIAL_COLUMNS.join(', ')}</code> (one row per trial, response 0 or 1) or <code>{COUNT_COLUMNS.join(', ')}</code> (trials and
        reference responses per level, e.g. read off a figure). Levels in ms. At most {MB} MB.
      </p>
      <div className="mt-2 grid grid-cols-1 gap-2 sm:grid-cols-2 lg:grid-cols-5">
        <Field label="Name of the data set" error={formState.errors.label?.message}>
          <input className={inputCls} {...register('label')} placeholder="e.g. Experiment 1, order task" />
        </Field>
        <Field label="Task" error={formState.errors.task?.message}>
          <select className={inputCls} {...register('task')}>
            {TRIAL_TASKS.map((t) => (
              <option key={t} value={t}>
                {TRIAL_TASK_LABELS[t]}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Modality" error={formState.errors.modality?.message}>
          <select className={inputCls} {...register('modality')}>
            {MODALITIES.map((m) => (
              <option key={m} value={m}>
                {MODALITY_LABELS[m]}
              </option>
            ))}
          </select>
        </Field>
        {task !== 'simultaneity' && (
          <Field label="Psychometric function" error={formState.errors.model?.message}>
            <select className={inputCls} {...register('model')}>
              {PSYCHOMETRIC_MODELS.map((m) => (
                <option key={m} value={m}>
                  {MODEL_LABELS[m]}
                </option>
              ))}
            </select>
          </Field>
        )}
        <Field label="Bootstrap resamples per fit" error={formState.errors.resamples?.message}>
          <input className={`${inputCls} text-right tabular-nums`} inputMode="numeric" {...register('resamples')} />
        </Field>
      </div>
      <div className="mt-2 flex flex-wrap items-end gap-3">
        <Field label="CSV file" error={fileError ?? undefined}>
          <input
            type="file"
            accept=".csv,text/csv,text/plain"
            className="text-sm"
            onChange={(e) => {
              setFile(e.target.files?.[0] ?? null);
              setFileError(null);
            }}
          />
        </Field>
        <Button variant="primary" type="submit" disabled={busy}>
          {uploader.isPending ? 'Uploading…' : starter.isPending ? 'Starting the fits…' : 'Upload and fit'}
        </Button>
      </div>
      {done && (
        <p role="status" className="mt-2 text-sm">
          ✓ {done}
        </p>
      )}
      {refusal && (
        <div role="alert" className="mt-2 rounded border-l-4 border-refusal bg-refusal-light px-3 py-2 text-sm text-refusal">
          <strong>✕ Not uploaded:</strong> {refusal.message}
          {refusal.lines.length > 0 && (
            <ul className="mt-1 list-disc pl-5" aria-label="Rows with problems">
              {refusal.lines.map((l) => (
                <li key={l}>{l}</li>
              ))}
            </ul>
          )}
        </div>
      )}
    </form>
  );
}
