import { useRef } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { useNavigate } from 'react-router-dom';
import type { ImportFormat } from '../../../../shared/schemas/references';
import { Button } from '../../../components/ui/Button';
import { Field, FieldError } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useCreateImport } from '../api/create-import';
import { importFormSchema } from '../forms/import-form';

const FORMATS: Array<{ value: ImportFormat; label: string; hint: string }> = [
  { value: 'bibtex', label: 'BibTeX', hint: 'Paste @article{…} entries, or choose a .bib file.' },
  { value: 'ris', label: 'RIS', hint: 'Records from “TY  -” to “ER  -”, or a .ris file.' },
  { value: 'doi', label: 'DOI list', hint: 'One DOI per line (10.5555/… or https://doi.org/…). They are looked up in the background.' },
];

export function ImportForm() {
  const navigate = useNavigate();
  const mutation = useCreateImport();
  const form = useForm({ resolver: formResolver(importFormSchema), defaultValues: { format: 'bibtex' as ImportFormat, text: '', file: null } });
  const { errors } = form.formState;
  const format = useWatch({ control: form.control, name: 'format' });
  const file = useWatch({ control: form.control, name: 'file' });
  const hasFile = !!file?.length;
  const fileInput = useRef<HTMLInputElement | null>(null);
  const { ref: fileRef, ...fileField } = form.register('file');
  const submit = form.handleSubmit((input) =>
    mutation.mutate(input, { onSuccess: (data) => navigate(`/imports/${data.batch.id}`), onError: (err) => showServerErrors(err, form.setError, ['format', 'text', 'file']) }),
  );
  const serverMessage = errors.root?.server?.message;
  return (
    <form className="grid max-w-4xl gap-3" onSubmit={submit} noValidate>
      <fieldset className="flex flex-wrap gap-5">
        <legend className="mb-1 text-sm font-semibold">What are you bringing in?</legend>
        {FORMATS.map((f) => (
          <label key={f.value} className="flex items-center gap-1.5">
            <input type="radio" value={f.value} {...form.register('format')} />
            {f.label}
          </label>
        ))}
        <FieldError message={errors.format?.message} className="text-sm text-refusal" />
      </fieldset>
      <p className="text-sm text-ink-soft">{FORMATS.find((f) => f.value === format)?.hint}</p>
      <Field label={format === 'doi' ? 'DOIs' : 'Entries'} error={errors.text?.message} labelClassName="block" errorClassName="text-refusal">
        <textarea className="mt-0.5 w-full rounded border border-paper-edge bg-white px-2 py-1 font-mono text-xs" rows={12} {...form.register('text')} disabled={hasFile} spellCheck={false} />
      </Field>
      <div className="flex flex-wrap items-center gap-2 text-sm">
        <label>
          …or upload a file (.bib, .ris or .txt, up to 20 MB){' '}
          <input
            type="file"
            accept=".bib,.bibtex,.ris,.txt,text/plain"
            {...fileField}
            ref={(el) => {
              fileRef(el);
              fileInput.current = el;
            }}
            aria-invalid={!!errors.file}
            aria-describedby="import-file-error"
          />
        </label>
        {hasFile && (
          <Button
            onClick={() => {
              form.setValue('file', null);
              if (fileInput.current) fileInput.current.value = '';
            }}
          >
            Remove file
          </Button>
        )}
        <FieldError id="import-file-error" message={errors.file?.message} className="text-refusal" />
      </div>
      {serverMessage && <ErrorNote error={serverMessage} />}
      {mutation.error && !Object.keys(errors).length && <ErrorNote error={mutation.error} />}
      <div>
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Importing…' : 'Import'}
        </Button>
      </div>
    </form>
  );
}
