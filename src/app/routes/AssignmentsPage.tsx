import { useState } from 'react';
import { Link } from 'react-router-dom';
import { Button } from '../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { StateBadge } from '../../components/ui/StateBadge';
import { useCreateAssignment } from '../../features/reconciliation/api/create-assignment';
import { useAssignments, type AssignmentsQuery } from '../../features/reconciliation/api/get-assignments';
import { useCandidates, type CandidatesQuery, type Candidate } from '../../features/reconciliation/api/get-candidates';
import { useCoders } from '../../features/reconciliation/api/get-coders';
import { RequireRole } from './RequireRole';

function AssignRow({ c }: { c: Candidate }) {
  const { data: coders } = useCoders();
  const create = useCreateAssignment();
  const [a, setA] = useState('');
  const [b, setB] = useState('');
  const [done, setDone] = useState(false);
  const same = a !== '' && a === b;
  return (
    <tr>
      <td>
        <Link to={`/references/${c.id}`}>{c.referenceLabel}</Link>
      </td>
      <td className="reading text-xs">{c.title}</td>
      <td>{c.settled ? <StateBadge state="settled" /> : c.assignmentState ? <StateBadge state={c.assignmentState} /> : <span className="text-xs text-ink-faint">not coded</span>}</td>
      <td>
        <div className="flex flex-wrap items-center gap-1 text-sm">
          <select aria-label={`First coder for ${c.referenceLabel}`} className="rounded border border-paper-edge bg-white px-1 py-0.5" value={a} onChange={(e) => setA(e.target.value)}>
            <option value="">first coder</option>
            {coders?.items.map((u) => (
              <option key={u.id} value={u.id}>
                @{u.login}
              </option>
            ))}
          </select>
          <select aria-label={`Second coder for ${c.referenceLabel}`} className="rounded border border-paper-edge bg-white px-1 py-0.5" value={b} onChange={(e) => setB(e.target.value)}>
            <option value="">second coder</option>
            {coders?.items.map((u) => (
              <option key={u.id} value={u.id}>
                @{u.login}
              </option>
            ))}
          </select>
          <Button
            variant="primary"
            disabled={!a || !b || same || create.isPending || done}
            onClick={() => create.mutate({ referenceId: c.id, coder1Id: Number(a), coder2Id: Number(b) }, { onSuccess: () => setDone(true) })}
          >
            Assign
          </Button>
          {same && <span className="text-xs text-refusal">✕ choose two different coders</span>}
          {done && <span className="text-xs">✓ Assigned; both coders are e-mailed</span>}
        </div>
        {create.error && <ErrorNote error={create.error} />}
      </td>
    </tr>
  );
}

export function AssignmentsPage() {
  const [cq, setCq] = useState<CandidatesQuery>({ status: 'unassigned', page: 1, pageSize: 15, sort: 'reference', order: 'asc' });
  const [aq, setAq] = useState<AssignmentsQuery>({ page: 1, pageSize: 15, sort: 'updated', order: 'desc' });
  const candidates = useCandidates(cq);
  const assignments = useAssignments(aq);
  return (
    <RequireRole role="curator">
      <h1>Double coding</h1>
      <h2>Assign an included reference to two coders</h2>
      <div className="flex flex-wrap gap-3 text-sm">
        <label>
          Find{' '}
          <input className="rounded border border-paper-edge bg-white px-2 py-1" value={cq.q ?? ''} onChange={(e) => setCq({ ...cq, q: e.target.value || undefined, page: 1 })} placeholder="title or first author" />
        </label>
        <label>
          <input type="checkbox" checked={cq.status === 'any'} onChange={(e) => setCq({ ...cq, status: e.target.checked ? 'any' : 'unassigned', page: 1 })} /> also show coded references
        </label>
      </div>
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
                <th>Coders</th>
              </tr>
            </thead>
            <tbody>
              {candidates.data.items.map((c) => (
                <AssignRow key={c.id} c={c} />
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
