import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { reasonSchema } from '../../../shared/schemas/extraction';
import { Link, useNavigate, useParams } from 'react-router-dom';
import { Button } from '../../components/ui/Button';
import { Field } from '../../components/ui/Field';
import { formResolver } from '../../lib/forms/resolver';
import { Caution, ErrorNote, Loading } from '../../components/ui/Notice';
import { useHasRole } from '../../features/auth/api/get-me';
import { SheetView } from '../../features/extraction/components/SheetView';
import { StateBadge } from '../../components/ui/StateBadge';
import { useRecord } from '../../features/extraction/api/get-record';
import { useRecords } from '../../features/reconciliation/api/get-records';
import { useReopenRecord } from '../../features/reconciliation/api/reopen-record';
import { useSettleRecord } from '../../features/reconciliation/api/settle-record';
import { useWithdrawRecord } from '../../features/reconciliation/api/withdraw-record';
import { useWithdrawEffect } from '../../features/reconciliation/api/withdraw-effect';

/** Withdrawing one effect: which one, and why (the server's reason rule). */
const withdrawEffectSchema = z.object({
  effectId: z.string().min(1, 'choose the effect to withdraw').transform(Number),
  reason: reasonSchema.shape.reason,
});

/** A curator's action on the record that needs a reason kept with it (reopen, withdraw, settle). */
function ReasonAction({ label, onRun, pending, error }: { label: string; onRun: (reason: string) => void; pending: boolean; error: unknown }) {
  const [open, setOpen] = useState(false);
  const form = useForm({ resolver: formResolver(reasonSchema), defaultValues: { reason: '' } });
  const reasonError = form.formState.errors.reason?.message;
  if (!open) return <Button onClick={() => setOpen(true)}>{label}…</Button>;
  return (
    <form className="my-2 rounded border border-paper-edge p-2" noValidate onSubmit={form.handleSubmit((v) => onRun(v.reason))}>
      <Field label="Reason (kept with the record)" error={reasonError} className="block text-sm">
        <textarea className="w-full rounded border border-paper-edge bg-white px-2 py-1" rows={2} {...form.register('reason')} autoFocus />
      </Field>
      <div className="mt-1 flex gap-2">
        <Button type="submit" variant="primary" disabled={pending}>
          {label}
        </Button>
        <Button onClick={() => setOpen(false)}>Cancel</Button>
      </div>
      <ErrorNote error={error} />
    </form>
  );
}

function WithdrawEffect({ effects }: { effects: { id: number; label: string }[] }) {
  const withdraw = useWithdrawEffect();
  const form = useForm({ resolver: formResolver(withdrawEffectSchema), defaultValues: { effectId: '', reason: '' } });
  const { errors } = form.formState;
  return (
    <form
      className="my-3 flex flex-wrap items-start gap-2 text-sm"
      noValidate
      onSubmit={form.handleSubmit((v) => withdraw.mutate({ id: v.effectId, reason: v.reason }, { onSuccess: () => form.reset() }))}
    >
      <Field label="Withdraw one effect" error={errors.effectId?.message}>
        <select className="rounded border border-paper-edge bg-white px-2 py-1" {...form.register('effectId')}>
          <option value="">— effect —</option>
          {effects.map((f) => (
            <option key={f.id} value={f.id}>
              {f.label}
            </option>
          ))}
        </select>
      </Field>
      <Field label="Reason" error={errors.reason?.message} className="grow text-sm">
        <input className="w-full rounded border border-paper-edge bg-white px-2 py-1" {...form.register('reason')} />
      </Field>
      <Button type="submit" variant="danger" className="mt-4" disabled={withdraw.isPending}>
        Withdraw the effect
      </Button>
      {withdraw.isSuccess && <span role="status">✓ Withdrawn; it no longer enters analyses.</span>}
      <ErrorNote error={withdraw.error} />
    </form>
  );
}

export function RecordPage() {
  const id = Number(useParams().id);
  const navigate = useNavigate();
  const { data, error, isLoading } = useRecord(id);
  const history = useRecords(data?.extraction.referenceId);
  const curator = useHasRole('curator');
  const reopen = useReopenRecord();
  const withdraw = useWithdrawRecord();
  const settle = useSettleRecord();
  const x = data?.extraction;
  return (
    <div>
      {isLoading && <Loading what="Loading the record" />}
      <ErrorNote error={error} />
      {x && (
        <>
          <h1>
            Settled record of {x.reference.label}, version {x.recordVersion}
          </h1>
          <p className="reading">{x.reference.title}</p>
          <p className="mb-2 text-sm text-ink-soft">
            <StateBadge state={x.state} /> {x.settledAt && <>settled {new Date(x.settledAt).toISOString().slice(0, 10)} · </>}
            <Link to={`/references/${x.referenceId}`}>reference</Link>
          </p>
          {x.supersededBy && (
            <Caution title="Old version">
              This version was replaced by <Link to={`/records/${x.supersededBy}`}>version {x.recordVersion! + 1}</Link>; analyses use only the current settled version.
            </Caution>
          )}
          {x.reopenReason && <Caution title="Reopened">{x.reopenReason}</Caution>}
          {curator && !x.supersededBy && (
            <div className="my-2 flex flex-wrap items-start gap-2">
              {x.state === 'settled' && (
                <>
                  <ReasonAction label="Reopen" pending={reopen.isPending} error={reopen.error} onRun={(reason) => reopen.mutate({ id, reason }, { onSuccess: (r) => navigate(`/records/${r.recordId}`) })} />
                  <ReasonAction label="Withdraw" pending={withdraw.isPending} error={withdraw.error} onRun={(reason) => withdraw.mutate({ id, reason })} />
                </>
              )}
              {x.state === 'draft' && (
                <>
                  <Link to={`/extractions/${id}`} className="rounded border border-paper-edge px-3 py-1.5 text-sm">
                    Edit this version
                  </Link>
                  <ReasonAction label="Settle this version" pending={settle.isPending} error={settle.error} onRun={(rationale) => settle.mutate({ id, rationale })} />
                </>
              )}
            </div>
          )}
          <SheetView studies={data.studies} />
          {curator && !x.supersededBy && x.state === 'settled' && (
            <WithdrawEffect effects={data.studies.flatMap((st, i) => st.effects.map((f, j) => ({ id: f.id, label: `Study ${i + 1}, effect ${j + 1}: ${f.label}` })))} />
          )}
          {history.data && (
            <>
              <h2>Versions and settlements</h2>
              <table>
                <thead>
                  <tr>
                    <th className="num">Version</th>
                    <th>State</th>
                    <th>Current</th>
                    <th className="num">Created (UTC)</th>
                  </tr>
                </thead>
                <tbody>
                  {history.data.records.map((r) => (
                    <tr key={r.id}>
                      <td className="num">
                        <Link to={`/records/${r.id}`}>{r.recordVersion}</Link>
                      </td>
                      <td>
                        <StateBadge state={r.state} />
                      </td>
                      <td>{r.current ? '✓ current' : 'replaced'}</td>
                      <td className="num">{new Date(r.createdAt).toISOString().slice(0, 16).replace('T', ' ')}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <table className="mt-2">
                <thead>
                  <tr>
                    <th className="num">When (UTC)</th>
                    <th>What</th>
                    <th>By</th>
                    <th>Rationale</th>
                  </tr>
                </thead>
                <tbody>
                  {history.data.settlements.map((s) => (
                    <tr key={s.id}>
                      <td className="num">{new Date(s.at).toISOString().slice(0, 16).replace('T', ' ')}</td>
                      <td>{s.kind}</td>
                      <td>{s.by ? `@${s.by}` : 'automatic'}</td>
                      <td className="whitespace-pre-wrap text-xs">{s.rationale}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </>
          )}
        </>
      )}
    </div>
  );
}
