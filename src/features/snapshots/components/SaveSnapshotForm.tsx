import { useForm } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { z } from 'zod';
import { snapshotCreateSchema, type SynthesisRequest } from '../../../../shared/schemas/synthesis';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { ErrorNote } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { showServerErrors } from '../../../lib/forms/server-errors';
import { useCreateSnapshot } from '../api/create-snapshot';

/** An empty title is no title: the server names the snapshot from its filters. */
export const snapshotTitleSchema = z
  .object({ title: z.string() })
  .transform(({ title }): { title?: string } => (title.trim() ? { title } : {}))
  .pipe(z.object({ title: snapshotCreateSchema.shape.title }));

/** Freezes the synthesis the page shows (its request) as a snapshot with a stable address. */
export function SaveSnapshotForm({ request }: { request: SynthesisRequest }) {
  const save = useCreateSnapshot();
  const form = useForm({ resolver: formResolver(snapshotTitleSchema), defaultValues: { title: '' } });
  const titleError = form.formState.errors.title?.message;
  return (
    <form
      className="contents"
      noValidate
      onSubmit={form.handleSubmit((v) => save.mutate({ ...request, ...v }, { onError: (err) => showServerErrors(err, form.setError, ['title']) }))}
    >
      <Field label="Snapshot title (optional)" error={titleError} className="flex min-w-0 max-w-full flex-col text-sm" labelClassName="font-semibold">
        <input {...form.register('title')} maxLength={200} className="w-96 max-w-full rounded border border-paper-edge bg-white/70 px-2 py-1" placeholder="Named from the filters when left empty" />
      </Field>
      <Button type="submit" variant="primary" disabled={save.isPending}>
        {save.isPending ? 'Saving…' : 'Save snapshot'}
      </Button>
      {save.data && (
        <p role="status" className="text-sm">
          ✓ {save.data.existing ? 'Already saved, the same request' : 'Saved'}, frozen at registry version {save.data.registryVersion}: <Link to={`/snapshots/${save.data.id}`}>{save.data.url}</Link>
        </p>
      )}
      {!titleError && <ErrorNote error={save.error} title="Not saved" />}
    </form>
  );
}
