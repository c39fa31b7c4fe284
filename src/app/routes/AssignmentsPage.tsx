import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import { z } from 'zod';
import { createAssignmentSchema } from '../../../shared/schemas/extraction';
import type { CreatedAssignment } from '../../../shared/schemas/reconciliation';
import { Link } from 'react-router-dom';
import { Button } from '../../components/ui/Button';
import { FieldError } from '../../components/ui/Field';
import { taking } from '../../lib/forms/fields';
import { formResolver } from '../../lib/forms/resolver';
import { showServerErrors } from '../../lib/forms/server-errors';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { StateBadge } from '../../components/ui/StateBadge';
import { useCreateAssignment } from '../../features/reconciliation/api/create-assignment';
import { useAssignments, type AssignmentsQuery } from '../../features/reconciliation/api/get-assignments';
import { useCandidates, type CandidatesQuery, type Candidate } from '../../features/reconciliation/api/get-candidates';
import { useCoders } from '../../features/reconciliation/api/get-coders';
import { RequireRole } from './RequireRole';

/** Two coders for one reference, checked with the server's schema (two different people). */
const assignmentSchema = (referenceId: number) =>
  z
    .object({ coder1Id: z.string().min(1, 'choose the first coder'), coder2Id: z.string().min(1, 'choose the second coder') })
    .transform((v) => ({ referenceId, coder1Id: Number(v.coder1Id), coder2Id: Number(v.coder2Id) }))
    .pipe(taking<{ referenceId: number; coder1Id: number; coder2Id: number }>()(createAssignmentSchema));

function assignedNote(a: CreatedAssignment): string {
  const took = a.adopted.length ? ` The pair took over ${a.adopted.map((x) => `@${x.coder}’s ${x.state} sheet`).join(' and ')}.` : '';
  if (a.state === 'settled') return `✓ Paired.${took} Both submitted sheets agreed, so the record is settled.`;
  if (a.state === 'disputed') return `≠ Paired.${took} The submitted sheets differ in ${a.discrepancies} field${a.discrepancies === 1 ? '' : 's'}: the pair is in the reconciliation queue.`;
  return `✓ Assigned; both coders are e-mailed.${took}`;
}

function AssignRow({ c, onAssigned }: { c: Candidate; onAssigned: (note: string) => void }) {
  const { data: coders } = useCoders();
  const create = useCreateAssignment();
  const schema = useMemo(() => assignmentSchema(c.id), [c.id]);
  // A claimant codes in the pair: their sheet joins it as it is.
  const claimants = c.claims.map((x) => String(x.coderId));
  const form = useForm({ resolver: formResolver(schema), defaultValues: { coder1Id: claimants[0] ?? '', coder2Id: claimants[1] ?? '' }, mode: 'onChange' });
  const { errors } = form.formState;
  const done = create.isSuccess;
  const coderSelect = (name: 'coder1Id' | 'coder2Id', label: string, placeholder: string) => (
    <select
      aria-label={`${label} for ${c.referenceLabel}`}
      className="rounded border border-paper-edge bg-white px-1 py-0.5"
      {...form.register(name, { deps: name === 'coder1Id' ? ['coder2Id'] : undefined })}
      aria-invalid={!!errors[name]}
      aria-describedby={`assign-${c.id}-error`}
    >
      <option value="">{placeholder}</option>
      {coders?.items.map((u) => (
        <option key={u.id} value={u.id} disabled={u.you && !coders.selfAssignable}>
          @{u.login}
          {u.you ? (coders.selfAssignable ? ' (you)' : ' (you: no other curator to reconcile)') : ''}
        </option>
      ))}
    </select>
  );
  const message = errors.coder1Id?.message ?? errors.coder2Id?.message ?? errors.root?.server?.message;
  return (
    <tr>
      <td>
        <Link to={`/references/${c.id}`}>{c.referenceLabel}</Link>
      </td>
      <td className="reading text-xs">{c.title}</td>
      <td>{c.settled ? <StateBadge state="settled" /> : c.assignmentState ? <StateBadge state={c.assignmentState} /> : <span className="text-xs text-ink-faint">not coded</span>}</td>
      <td data-testid={`claims-${c.id}`}>
        {c.claims.length === 0 ? (
          <span className="text-xs text-ink-faint">none</span>
        ) : (
          <ul className="text-xs">
            {c.claims.map((x) => (
              <li key={x.extractionId}>
                @{x.coder} <StateBadge state={x.state} />
              </li>
            ))}
          </ul>
        )}
      </td>
      <td>
        <form
          className="flex flex-wrap items-center gap-1 text-sm"
          noValidate
          onSubmit={form.handleSubmit((body) =>
            // the row leaves the list (and unmounts) once the list refetches, so the outcome is said above the table;
            // mutateAsync settles even after the row is gone, unlike mutate's per-call callbacks
            create.mutateAsync(body).then(
              (created) => onAssigned(`${c.referenceLabel}: ${assignedNote(created)}`),
              (err: unknown) => showServerErrors(err, form.setError, ['coder1Id', 'coder2Id']),
            ),
          )}
        >
          {coderSelect('coder1Id', 'First coder', 'first coder')}
          {coderSelect('coder2Id', 'Second coder', 'second coder')}
          <Button type="submit" variant="primary" disabled={create.isPending || done}>
            Assign
          </Button>
          <FieldError id={`assign-${c.id}-error`} message={message} className="text-xs text-refusal" />
        </form>
        {create.error && !message && <ErrorNote error={create.error} />}
      </td>
    </tr>
  );
}

/** Whoever codes a pair may not reconcile it, so a curator codes only when another curator can settle the pair. */
function SelfAssignNote() {
  const { data } = useCoders();
  if (!data) return null;
  return (
    <p className="text-sm text-ink-soft" data-testid="self-assign-note">
      {data.selfAssignable
        ? `You may code a pair yourself: ${data.otherCurators.map((l) => `@${l}`).join(', ')} can then reconcile it (a coder never settles their own pair).`
        : 'You cannot code a pair yourself: no other curator could reconcile it, and a coder never settles their own pair. An administrator can make a second person curator.'}
    </p>
  );
}

export function AssignmentsPage() {
  const [cq, setCq] = useState<CandidatesQuery>({ status: 'unassigned', page: 1, pageSize: 15, sort: 'reference', order: 'asc' });
  const [aq, setAq] = useState<AssignmentsQuery>({ page: 1, pageSize: 15, sort: 'updated', order: 'desc' });
  const candidates = useCandidates(cq);
  const [assigned, setAssigned] = useState<string | null>(null);
  const assignments = useAssignments(aq);
  return (
    <RequireRole role="curator">
      <h1>Double coding</h1>
      <h2>Assign an included reference to two coders</h2>
      <SelfAssignNote />
      <div className="flex flex-wrap gap-3 text-sm">
        <label>
          Find{' '}
          <input className="rounded border border-paper-edge bg-white px-2 py-1" value={cq.q ?? ''} onChange={(e) => setCq({ ...cq, q: e.target.value || undefined, page: 1 })} placeholder="title or first author" />
        </label>
        <label>
          <input type="checkbox" checked={cq.status === 'any'} onChange={(e) => setCq({ ...cq, status: e.target.checked ? 'any' : 'unassigned', page: 1 })} /> also show coded references
        </label>
      </div>
      {assigned && (
        <p role="status" className="mt-2 text-sm">
          {assigned}
        </p>
      )}
      <ErrorNote error={candidates.error} />
      {candidates.isLoading && <Loading what="Loading references" />}
      {candidates.data && candidates.data.total === 0 && <EmptyState>No included reference is waiting. Screen references in (Screening) to code them here.</EmptyState>}
      {candidates.data && candidates.data.total > 0 && (
        <>
          <table className="mt-2">
            <thead>
              <tr>
                <SortHeader field="reference" label="Reference" sort={cq.sort} order={cq.order} onSort={(sort, order) => setCq({ ...cq, sort, order })} />
                <th>Title</th>
                <th>Status</th>
                <th>Claims</th>
                <th>Coders</th>
              </tr>
            </thead>
            <tbody>
              {candidates.data.items.map((c) => (
                <AssignRow key={c.id} c={c} onAssigned={setAssigned} />
              ))}
            </tbody>
          </table>
          <Pager page={cq.page} pageSize={cq.pageSize} total={candidates.data.total} onPage={(page) => setCq({ ...cq, page })} />
        </>
      )}
      <h2>Assignments</h2>
      <ErrorNote error={assignments.error} />
      {assignments.data && assignments.data.total === 0 && <EmptyState>No assignments yet: assign a reference above.</EmptyState>}
      {assignments.data && assignments.data.total > 0 && (
        <>
          <table>
            <thead>
              <tr>
                <SortHeader field="reference" label="Reference" sort={aq.sort} order={aq.order} onSort={(sort, order) => setAq({ ...aq, sort, order })} />
                <th>Coders</th>
                <th>State</th>
                <th className="num">Submitted (of 2)</th>
                <th className="num">Open discrepancies</th>
                <SortHeader field="updated" label="Last change (UTC)" sort={aq.sort} order={aq.order} onSort={(sort, order) => setAq({ ...aq, sort, order })} numeric />
              </tr>
            </thead>
            <tbody>
              {assignments.data.items.map((a) => (
                <tr key={a.id}>
                  <td>{a.state === 'disputed' ? <Link to={`/reconciliation/${a.id}`}>{a.referenceLabel}</Link> : a.referenceLabel}</td>
                  <td>
                    @{a.coder1} & @{a.coder2}
                  </td>
                  <td>
                    <StateBadge state={a.state} />
                  </td>
                  <td className="num">{a.submitted}</td>
                  <td className="num">{a.openDiscrepancies}</td>
                  <td className="num">{new Date(a.updatedAt).toISOString().slice(0, 16).replace('T', ' ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={aq.page} pageSize={aq.pageSize} total={assignments.data.total} onPage={(page) => setAq({ ...aq, page })} />
        </>
      )}
    </RequireRole>
  );
}
