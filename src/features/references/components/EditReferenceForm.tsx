import { useMemo, type ReactElement } from 'react';
import { useForm, type FieldErrors } from 'react-hook-form';
import { Button } from '../../../components/ui/Button';
import { FieldError } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useEditReference } from '../api/edit-reference';
import type { ReferenceDetail } from '../api/types';
import { editReferenceSchema, editReferenceValues, type EditReferenceValues } from '../forms/edit-reference';

const field = 'mt-0.5 w-full rounded border border-paper-edge bg-white px-2 py-1 text-sm aria-[invalid=true]:border-refusal';
const FIELDS = ['title', 'year', 'container', 'doi', 'authors', 'abstract'] as const;

/** An author's message names the line it is about ("line 2: family name is required"). */
function authorsMessage(errors: FieldErrors<EditReferenceValues>): string | undefined {
  const e = errors.authors as unknown;
  if (!e) return undefined;
  if (typeof (e as { message?: unknown }).message === 'string') return (e as { message: string }).message;
  const lines = Object.entries(e as Record<string, { family?: { message?: string }; given?: { message?: string } }>);
  const [index, line] = lines.find(([, l]) => l?.family?.message || l?.given?.message) ?? [];
  return index === undefined ? undefined : `line ${Number(index) + 1}: ${line?.family?.message ?? line?.given?.message}`;
}

function Labelled({ label, name, error, className, children }: { label: string; name: string; error?: string; className?: string; children: ReactElement }) {
  return (
    <label className={className}>
      {label}
      {children}
      <FieldError id={`edit-${name}-error`} message={error} className="text-sm text-refusal" />
    </label>
  );
}

export function EditReferenceForm({ detail, onDone }: { detail: ReferenceDetail; onDone: () => void }) {
  const r = detail.reference;
  const mutation = useEditReference();
  const schema = useMemo(() => editReferenceSchema(r.version), [r.version]);
  const form = useForm({ resolver: formResolver(schema), defaultValues: editReferenceValues(r) });
  const { errors } = form.formState;
  const a11y = (name: (typeof FIELDS)[number], message?: string) => ({ 'aria-invalid': !!message, 'aria-describedby': `edit-${name}-error` });
  const authors = form.watch('authors');
  const authorsError = authorsMessage(errors);
  return (
    <form
      className="grid max-w-3xl gap-3"
      noValidate
      onSubmit={form.handleSubmit((edit) => mutation.mutate({ id: r.id, edit }, { onSuccess: onDone, onError: (err) => showServerErrors(err, form.setError, FIELDS) }))}
    >
      <Labelled label="Title" name="title" error={errors.title?.message}>
        <input className={field} {...form.register('title')} {...a11y('title', errors.title?.message)} />
      </Labelled>
      <div className="grid grid-cols-3 gap-3">
        <Labelled label="Year" name="year" error={errors.year?.message}>
          <input className={field} inputMode="numeric" {...form.register('year')} {...a11y('year', errors.year?.message)} />
        </Labelled>
        <Labelled label="DOI" name="doi" error={errors.doi?.message} className="col-span-2">
          <input className={field} placeholder="10.5555/…" {...form.register('doi')} {...a11y('doi', errors.doi?.message)} />
        </Labelled>
      </div>
      <Labelled label="Journal or book" name="container" error={errors.container?.message}>
        <input className={field} {...form.register('container')} {...a11y('container', errors.container?.message)} />
      </Labelled>
      <Labelled label="Authors, one per line as “Family, Given”" name="authors" error={authorsError}>
        <textarea className={`${field} font-mono`} rows={Math.min(8, Math.max(2, authors.split('\n').length))} {...form.register('authors')} {...a11y('authors', authorsError)} />
      </Labelled>
      <Labelled label="Abstract" name="abstract" error={errors.abstract?.message}>
        <textarea className={field} rows={3} {...form.register('abstract')} {...a11y('abstract', errors.abstract?.message)} />
      </Labelled>
      {errors.root?.server && <ErrorNote error={errors.root.server.message} />}
      {mutation.error && !Object.keys(errors).length && <ErrorNote error={mutation.error} />}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" disabled={mutation.isPending}>
          {mutation.isPending ? 'Saving…' : 'Save changes'}
        </Button>
        <Button onClick={onDone}>Cancel</Button>
      </div>
    </form>
  );
}
