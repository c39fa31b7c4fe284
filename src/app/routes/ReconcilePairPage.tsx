import { useMemo } from 'react';
import { FormProvider, useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import { TOLERANCE_TEXT } from '../../../shared/schemas/extraction';
import { Button } from '../../components/ui/Button';
import { Field } from '../../components/ui/Field';
import { formResolver } from '../../lib/forms/resolver';
import { showServerErrors } from '../../lib/forms/server-errors';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { SheetView } from '../../features/extraction/components/SheetView';
import { StateBadge } from '../../components/ui/StateBadge';
import { CURRENT_VOCABULARY, useManipulations } from '../../features/manipulations/api/get-manipulations';
import { usePair, type PairDetail } from '../../features/reconciliation/api/get-pair';
import { useReconcilePair } from '../../features/reconciliation/api/reconcile-pair';
import { DiscrepancyChoice } from '../../features/reconciliation/components/DiscrepancyChoice';
import { reconcileFormSchema, type ReconcileValues } from '../../features/reconciliation/forms/reconcile';
import { RequireRole } from './RequireRole';

/** The form starts from the saved decisions, if any; an open field has nothing chosen. */
function startingValues(data: PairDetail): ReconcileValues {
  return {
    version: data.assignment.version,
    rationale: '',
    decisions: data.discrepancies.map((d) => ({
      discrepancyId: d.id,
      resolution: d.status === 'resolved' && d.resolution ? d.resolution : '',
      value: d.resolution === 'value' ? d.resolvedValue : undefined,
      note: d.status === 'resolved' ? (d.rationale ?? '') : '',
    })),
  };
}

function ReconcileForm({ data, id }: { data: PairDetail; id: number }) {
  const reconcile = useReconcilePair();
  const vocabulary = useManipulations(CURRENT_VOCABULARY);
  const form = useForm<ReconcileValues, unknown, ReturnType<typeof reconcileFormSchema.parse>>({ resolver: formResolver(reconcileFormSchema), defaultValues: startingValues(data) });
  const editable = data.assignment.state === 'disputed' && !reconcile.isSuccess;
  const coders: [string, string] = [data.assignment.coder1, data.assignment.coder2];
  const { errors } = form.formState;
  const undecided = errors.decisions ? data.discrepancies.filter((_, i) => errors.decisions?.[i]).length : 0;
  const fields = data.discrepancies.flatMap((_, i) => [`decisions.${i}.resolution`, `decisions.${i}.value`, `decisions.${i}.discrepancyId`]).concat('rationale');
  return (
    <FormProvider {...form}>
      <form
        noValidate
        aria-label="Reconcile the two codings"
        onSubmit={form.handleSubmit((v) => reconcile.mutate({ assignmentId: id, ...v }, { onError: (err) => showServerErrors(err, form.setError, fields) }))}
      >
        {data.discrepancies.map((d, i) => (
          <DiscrepancyChoice key={d.id} row={d} index={i} coders={coders} editable={editable} terms={vocabulary.data?.items ?? []} />
        ))}
        {editable && (
          <>
            <Field label="Rationale for the reconciled entry" error={errors.rationale?.message} className="block text-sm">
              <textarea className="w-full rounded border border-paper-edge bg-white px-2 py-1" rows={2} {...form.register('rationale')} />
            </Field>
            <Button type="submit" variant="primary" className="mt-1" disabled={reconcile.isPending}>
              Save the reconciled entry
            </Button>
            {undecided > 0 && (
              <span className="ml-2 text-sm text-refusal" role="alert">
                ✕ {undecided} field{undecided === 1 ? ' needs' : 's need'} a decision or a value.
              </span>
            )}
            {errors.root?.server && <ErrorNote error={errors.root.server.message} />}
            {reconcile.error && !Object.keys(errors).length && <ErrorNote error={reconcile.error} />}
          </>
        )}
      </form>
      {(reconcile.data || data.assignment.recordId) && (
        <p role="status" className="mt-3 rounded border border-paper-edge bg-white px-3 py-2 text-sm">
          ✓ Settled. <Link to={`/records/${reconcile.data?.recordId ?? data.assignment.recordId}`}>Open the settled record</Link>; the coders are e-mailed.
        </p>
      )}
    </FormProvider>
  );
}

export function ReconcilePairPage() {
  const id = Number(useParams().id);
  const { data, error, isLoading } = usePair(id);
  const differs = useMemo(() => new Set(data?.discrepancies.map((d) => d.path) ?? []), [data]);
  const open = data?.discrepancies.filter((d) => d.status === 'open').length ?? 0;
  return (
    <RequireRole role="curator">
      {isLoading && <Loading what="Loading the pair" />}
      <ErrorNote error={error} />
      {data && (
        <>
          <h1>Reconcile: {data.assignment.reference.label}</h1>
          <p className="reading">{data.assignment.reference.title}</p>
          <p className="mb-2 text-sm text-ink-soft">
            <StateBadge state={data.assignment.state} /> coders @{data.assignment.coder1} (A) and @{data.assignment.coder2} (B)
          </p>
          <p className="mb-3 rounded border border-paper-edge bg-white/70 px-3 py-2 text-sm">
            <strong>Tolerance:</strong> {TOLERANCE_TEXT}
          </p>
          <h2>
            Fields the coders differ on ({data.discrepancies.length}, {open} open)
          </h2>
          <p className="mb-2 text-sm text-ink-soft">Take one coder’s value or enter your own for each field; the entry is saved once, with every decision.</p>
          <ReconcileForm key={data.assignment.version} data={data} id={id} />
          <h2>The two sheets side by side</h2>
          <p className="mb-1 text-sm text-ink-soft">
            <mark className="rounded bg-caution-light px-0.5 ring-1 ring-caution">≠ marked</mark> fields differ between the codings.
          </p>
          <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
            <section aria-label={`Sheet of @${data.assignment.coder1}`} className="min-w-0">
              <h3 className="font-bold">A: @{data.assignment.coder1}</h3>
              <SheetView compact studies={data.a?.studies ?? []} differs={differs} />
            </section>
            <section aria-label={`Sheet of @${data.assignment.coder2}`} className="min-w-0">
              <h3 className="font-bold">B: @{data.assignment.coder2}</h3>
              <SheetView compact studies={data.b?.studies ?? []} differs={differs} />
            </section>
          </div>
        </>
      )}
    </RequireRole>
  );
}
