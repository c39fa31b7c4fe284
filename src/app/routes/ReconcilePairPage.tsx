import { useForm } from 'react-hook-form';
import { Link, useParams } from 'react-router-dom';
import { settleSchema, TOLERANCE_TEXT } from '../../../shared/schemas/extraction';
import { Button } from '../../components/ui/Button';
import { Field } from '../../components/ui/Field';
import { formResolver } from '../../lib/forms/resolver';
import { ErrorNote, Loading } from '../../components/ui/Notice';
import { SheetView } from '../../features/extraction/components/SheetView';
import { StateBadge } from '../../components/ui/StateBadge';
import { CURRENT_VOCABULARY, useManipulations } from '../../features/manipulations/api/get-manipulations';
import { usePair } from '../../features/reconciliation/api/get-pair';
import { useSettlePair } from '../../features/reconciliation/api/settle-pair';
import { DiscrepancyRow } from '../../features/reconciliation/components/DiscrepancyRow';
import { RequireRole } from './RequireRole';

export function ReconcilePairPage() {
  const id = Number(useParams().id);
  const { data, error, isLoading } = usePair(id);
  const settle = useSettlePair();
  const vocabulary = useManipulations(CURRENT_VOCABULARY);
  const settleForm = useForm({ resolver: formResolver(settleSchema), defaultValues: { rationale: '' } });
  const open = data?.discrepancies.filter((d) => d.status === 'open').length ?? 0;
  const editable = data?.assignment.state === 'disputed';
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
          <h2>Discrepancies ({open} open)</h2>
          <table>
            <thead>
              <tr>
                <th>Field</th>
                <th>@{data.assignment.coder1} (A)</th>
                <th>@{data.assignment.coder2} (B)</th>
                <th>Decision</th>
              </tr>
            </thead>
            <tbody>
              {data.discrepancies.map((d) => (
                <DiscrepancyRow key={d.id} row={d} assignmentId={id} coders={[data.assignment.coder1, data.assignment.coder2]} editable={!!editable} terms={vocabulary.data?.items ?? []} />
              ))}
            </tbody>
          </table>
          {editable && (
            <form className="mt-3" noValidate onSubmit={settleForm.handleSubmit((v) => settle.mutate({ assignmentId: id, rationale: v.rationale }))}>
              <Field label="Note on the settlement (optional)" error={settleForm.formState.errors.rationale?.message} className="block text-sm">
                <textarea className="w-full rounded border border-paper-edge bg-white px-2 py-1" rows={2} {...settleForm.register('rationale')} />
              </Field>
              <Button type="submit" variant="primary" className="mt-1" disabled={open > 0 || settle.isPending}>
                Settle the record
              </Button>
              {open > 0 && <span className="ml-2 text-sm text-ink-soft">Decide every open discrepancy first ({open} left).</span>}
              <ErrorNote error={settle.error} />
            </form>
          )}
          {(settle.data || data.assignment.recordId) && (
            <p role="status" className="mt-3 rounded border border-paper-edge bg-white px-3 py-2 text-sm">
              ✓ Settled. <Link to={`/records/${settle.data?.recordId ?? data.assignment.recordId}`}>Open the settled record</Link>; the coders are e-mailed.
            </p>
          )}
          <h2>The two sheets side by side</h2>
          <div className="grid grid-cols-1 gap-4 lg:grid-cols-2">
            <section aria-label={`Sheet of @${data.assignment.coder1}`}>
              <h3 className="font-bold">A: @{data.assignment.coder1}</h3>
              <SheetView compact studies={data.a?.studies ?? []} />
            </section>
            <section aria-label={`Sheet of @${data.assignment.coder2}`}>
              <h3 className="font-bold">B: @{data.assignment.coder2}</h3>
              <SheetView compact studies={data.b?.studies ?? []} />
            </section>
          </div>
        </>
      )}
    </RequireRole>
  );
}
