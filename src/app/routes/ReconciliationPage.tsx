import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { useQueue, type QueueQuery } from '../../features/reconciliation/api/get-queue';
import { RequireRole } from './RequireRole';

export function ReconciliationPage() {
  const [q, setQ] = useState<QueueQuery>({ page: 1, pageSize: 25, sort: 'updated', order: 'asc' });
  const { data, error, isLoading } = useQueue(q);
  const onSort = (sort: QueueQuery['sort'], order: 'asc' | 'desc') => setQ({ ...q, sort, order, page: 1 });
  return (
    <RequireRole role="curator">
      <h1>Reconciliation queue</h1>
      <p className="mb-3 text-sm text-ink-soft">Pairs whose two codings disagree. Open one to compare the sheets side by side and settle each discrepancy with a rationale. How often coders agree: <Link to="/agreement">agreement</Link>.</p>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading the queue" />}
      {data && data.total === 0 && <EmptyState>✓ Nothing to reconcile. Disputed pairs appear here when both coders have submitted.</EmptyState>}
      {data && data.total > 0 && (
        <>
          <table>
            <thead>
              <tr>
                <SortHeader field="reference" label="Reference" sort={q.sort} order={q.order} onSort={onSort} />
                <th>Title</th>
                <th>Coders</th>
                <SortHeader field="open" label="Open / all discrepancies" sort={q.sort} order={q.order} onSort={onSort} numeric />
                <SortHeader field="updated" label="Waiting since (UTC)" sort={q.sort} order={q.order} onSort={onSort} numeric />
              </tr>
            </thead>
            <tbody>
              {data.items.map((i) => (
                <tr key={i.assignmentId}>
                  <td>
                    {i.youCoded ? (
                      <span>
                        {i.referenceLabel} <span className="text-xs text-ink-soft">(you coded this pair: another curator reconciles it)</span>
                      </span>
                    ) : (
                      <Link to={`/reconciliation/${i.assignmentId}`}>{i.referenceLabel}</Link>
                    )}
                  </td>
                  <td className="reading text-xs">{i.title}</td>
                  <td>
                    @{i.coder1} & @{i.coder2}
                  </td>
                  <td className="num">
                    {i.openDiscrepancies} / {i.discrepancies}
                  </td>
                  <td className="num">{new Date(i.updatedAt).toISOString().slice(0, 16).replace('T', ' ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
        </>
      )}
      {data && data.reopened.length > 0 && (
        <>
          <h2>Reopened records</h2>
          <table>
            <thead>
              <tr>
                <th>Reference</th>
                <th className="num">Version</th>
                <th>Reason</th>
              </tr>
            </thead>
            <tbody>
              {data.reopened.map((r) => (
                <tr key={r.recordId}>
                  <td>
                    <Link to={`/records/${r.recordId}`}>{r.referenceLabel}</Link>
                  </td>
                  <td className="num">{r.recordVersion}</td>
                  <td>{r.reason}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </>
      )}
    </RequireRole>
  );
}
