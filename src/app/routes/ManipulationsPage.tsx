import { useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { z } from 'zod';
import { manipulationCreateSchema, manipulationUpdateSchema } from '../../../shared/schemas/extraction';
import { Button } from '../../components/ui/Button';
import { Field, FieldError } from '../../components/ui/Field';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { SortHeader } from '../../components/ui/SortHeader';
import { Pager } from '../../components/ui/Pager';
import { useHasRole } from '../../features/auth/api/get-me';
import { useCreateManipulation } from '../../features/manipulations/api/create-manipulation';
import { useManipulations, type Manipulation, type ManipulationsQuery } from '../../features/manipulations/api/get-manipulations';
import { useUpdateManipulation } from '../../features/manipulations/api/update-manipulation';
import { ApiRequestError } from '../../lib/api-client';
import { formResolver } from '../../lib/forms/resolver';
import { showServerErrors } from '../../lib/forms/server-errors';

/** A curator renames a term; the label is checked as the server checks it. */
const renameSchema = z.object({ label: manipulationUpdateSchema.shape.label.unwrap() });

function Row({ m, curator }: { m: Manipulation; curator: boolean }) {
  const update = useUpdateManipulation();
  const form = useForm({ resolver: formResolver(renameSchema), values: { label: m.label } });
  const label = useWatch({ control: form.control, name: 'label' });
  const labelError = form.formState.errors.label?.message;
  return (
    <tr>
      <td>
        <code>{m.term}</code>
      </td>
      <td>
        {curator ? (
          <form
            className="flex flex-wrap gap-1"
            noValidate
            onSubmit={form.handleSubmit((v) => update.mutate({ term: m.term, version: m.version, label: v.label }, { onError: (err) => showServerErrors(err, form.setError, ['label']) }))}
          >
            <input
              aria-label={`Label of ${m.term}`}
              className="rounded border border-paper-edge bg-white px-2 py-0.5"
              {...form.register('label')}
              aria-invalid={!!labelError}
              aria-describedby={`label-${m.term}-error`}
            />
            <Button type="submit" disabled={label === m.label || update.isPending}>
              Rename
            </Button>
            <FieldError id={`label-${m.term}-error`} message={labelError} />
          </form>
        ) : (
          m.label
        )}
        {update.error && !labelError && <ErrorNote error={update.error} />}
      </td>
      <td className="text-xs">{m.description}</td>
      <td className="num">{m.settledEffects}</td>
      <td>
        {m.retired ? '⊘ retired' : '✓ in use'}
        {curator && (
          <Button className="ml-2" onClick={() => update.mutate({ term: m.term, version: m.version, retired: !m.retired })} disabled={update.isPending}>
            {m.retired ? 'Bring back' : 'Retire'}
          </Button>
        )}
      </td>
    </tr>
  );
}

function AddTerm() {
  const create = useCreateManipulation();
  const form = useForm({ resolver: formResolver(manipulationCreateSchema), defaultValues: { term: '', label: '', description: '' } });
  const { errors } = form.formState;
  return (
    <form
      className="mt-4 grid grid-cols-1 gap-2 rounded border border-paper-edge p-3 md:grid-cols-4"
      noValidate
      onSubmit={form.handleSubmit((v) => create.mutate(v, { onSuccess: () => form.reset(), onError: (err) => showServerErrors(err, form.setError, ['term', 'label', 'description']) }))}
    >
      <Field label="Term (stable slug)" error={errors.term?.message}>
        <input className="w-full rounded border border-paper-edge bg-white px-2 py-1" {...form.register('term')} placeholder="e.g. colour_saturation" />
      </Field>
      <Field label="Label" error={errors.label?.message}>
        <input className="w-full rounded border border-paper-edge bg-white px-2 py-1" {...form.register('label')} />
      </Field>
      <Field label="What was manipulated" error={errors.description?.message} className="text-sm md:col-span-2">
        <input className="w-full rounded border border-paper-edge bg-white px-2 py-1" {...form.register('description')} />
      </Field>
      <div>
        <Button type="submit" variant="primary" disabled={create.isPending}>
          Add the term
        </Button>
        {create.isSuccess && <span className="ml-2 text-xs">✓ Added</span>}
      </div>
      <ErrorNote error={errors.root?.server?.message ?? (create.error && !(create.error instanceof ApiRequestError && create.error.status === 400) ? create.error : null)} />
    </form>
  );
}

export function ManipulationsPage() {
  const curator = useHasRole('curator');
  const [q, setQ] = useState<Required<Pick<ManipulationsQuery, 'sort' | 'order' | 'page' | 'pageSize'>> & { includeRetired: boolean }>({ sort: 'label', order: 'asc', page: 1, pageSize: 50, includeRetired: false });
  const { data, error, isLoading } = useManipulations(q);
  return (
    <div>
      <h1>Manipulation vocabulary</h1>
      <p className="mb-3 text-sm text-ink-soft">
        Every coded effect names one manipulation. Terms are stable; curators may relabel or retire them without touching coded effects.
      </p>
      <label className="text-sm">
        <input type="checkbox" checked={q.includeRetired} onChange={(e) => setQ({ ...q, includeRetired: e.target.checked })} /> show retired terms
      </label>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading the vocabulary" />}
      {data && (
        <>
          <table className="mt-2">
            <thead>
              <tr>
                <SortHeader field="term" label="Term" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} />
                <SortHeader field="label" label="Label" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} />
                <th>Description</th>
                <SortHeader field="effects" label="Settled effects" sort={q.sort} order={q.order} onSort={(sort, order) => setQ({ ...q, sort, order })} numeric />
                <th>Status</th>
              </tr>
            </thead>
            <tbody>
              {data.items.map((m) => (
                <Row key={`${m.term}-${m.version}`} m={m} curator={curator} />
              ))}
            </tbody>
          </table>
          <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
        </>
      )}
      {curator && <AddTerm />}
    </div>
  );
}
