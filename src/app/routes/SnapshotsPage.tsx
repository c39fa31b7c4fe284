import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState, ErrorNote, Loading } from '../../components/ui/Notice';
import { Pager } from '../../components/ui/Pager';
import { SortHeader } from '../../components/ui/SortHeader';
import { useMe } from '../../features/auth/api/get-me';
import { useSnapshots, type SnapshotListQuery } from '../../features/snapshots/api/list-snapshots';
import { valueLabel } from '../../features/synthesis/labels';
import { fixed } from '../../lib/format';

export function SnapshotsPage() {
  const { data: me } = useMe();
  const [q, setQ] = useState<SnapshotListQuery>({ page: 1, pageSize: 25, sort: 'created_at', order: 'desc' });
  const { data, isLoading, error } = useSnapshots(q);
  const onSort = (sort: SnapshotListQuery['sort'], order: 'asc' | 'desc') => setQ({ ...q, sort, order, page: 1 });
  return (
    <div>
      <h1>Snapshots</h1>
      <p className="reading mb-3 max-w-3xl text-sm text-ink-soft">Frozen syntheses with stable addresses: each keeps its exact rows, results and figures, whatever happens to the registry afterwards.</p>
      {me && (
        <label className="mb-2 flex items-center gap-1.5 text-sm">
          <input type="checkbox" checked={q.mine === 'true'} onChange={(e) => setQ({ ...q, page: 1, mine: e.target.checked ? 'true' : undefined })} />
          Only mine
        </label>
      )}
      {isLoading && <Loading />}
      <ErrorNote error={error} />
      {data && data.total === 0 && (
        <EmptyState>
          No snapshots yet. Run a <Link to="/synthesis">synthesis</Link> and, as a reviewer, press “Save snapshot”.
        </EmptyState>
      )}
      {data && data.total > 0 && (
        <>
          <table>
            <thead>
              <tr>
                <SortHeader field="title" label="Title" sort={q.sort} order={q.order} onSort={onSort} />
                <th>Metric</th>
                <SortHeader field="k" label="Studies" sort={q.sort} order={q.order} onSort={onSort} numeric />
                <SortHeader field="estimate" label="Estimate (3 dp)" sort={q.sort} order={q.order} onSort={onSort} numeric />
                <th className="num">Registry version</th>
                <th>By</th>
                <SortHeader field="created_at" label="Saved (UTC)" sort={q.sort} order={q.order} onSort={onSort} />
              </tr>
            </thead>
            <tbody>
              {data.items.map((s) => (
                <tr key={s.id}>
                  <td>
                    <Link to={`/snapshots/${s.id}`}>{s.title}</Link>
                  </td>
                  <td>{valueLabel('metric', s.metric)}</td>
                  <td className="num">{s.k}</td>
                  <td className="num">{fixed(s.estimate, 3)}</td>
                  <td className="num">{s.registryVersion}</td>
                  <td>{s.createdBy ?? '—'}</td>
                  <td className="tabular-nums">{new Date(s.createdAt).toISOString().replace('T', ' ').slice(0, 16)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
        </>
      )}
    </div>
  );
}
