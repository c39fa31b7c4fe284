import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { useImports } from '../api/get-imports';

type Sort = 'created_at' | 'format' | 'total';

export function ImportHistory() {
  const [page, setPage] = useState(1);
  const [sort, setSort] = useState<Sort>('created_at');
  const [order, setOrder] = useState<'asc' | 'desc'>('desc');
  const pageSize = 10;
  const { data, error, isLoading } = useImports({ page, pageSize, sort, order });
  const onSort = (f: Sort, o: 'asc' | 'desc') => (setSort(f), setOrder(o), setPage(1));
  if (isLoading) return <Loading what="Loading earlier imports" />;
  if (error) return <ErrorNote error={error} />;
  if (!data?.total) return <EmptyState>No imports yet. Paste a BibTeX export above to start.</EmptyState>;
  return (
    <>
      <table>
        <thead>
          <tr>
            <SortHeader field="created_at" label="When (UTC)" sort={sort} order={order} onSort={onSort} />
            <SortHeader field="format" label="Format" sort={sort} order={order} onSort={onSort} />
            <th>Label</th>
            <SortHeader field="total" label="Entries" sort={sort} order={order} onSort={onSort} numeric />
            <th className="num">Imported</th>
            <th className="num">Duplicates</th>
            <th className="num">Rejected</th>
            <th>State</th>
          </tr>
        </thead>
        <tbody>
          {data.items.map((b) => (
            <tr key={b.id}>
              <td className="tabular-nums">
                <Link to={`/imports/${b.id}`}>{b.createdAt.slice(0, 16).replace('T', ' ')}</Link>
              </td>
              <td>{b.format}</td>
              <td>{b.label ?? '—'}</td>
              <td className="num">{b.total}</td>
              <td className="num">{b.counts.imported}</td>
              <td className="num">{b.counts.duplicate}</td>
              <td className="num">{b.counts.rejected}</td>
              <td>
                {b.state === 'queued'
                  ? '… queued'
                  : b.state === 'running'
                    ? `… ${b.processed} of ${b.total}`
                    : b.state === 'failed'
                      ? `✕ failed after ${b.processed} of ${b.total}`
                      : '✓ done'}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
      <Pager page={page} pageSize={pageSize} total={data.total} onPage={setPage} />
    </>
  );
}
