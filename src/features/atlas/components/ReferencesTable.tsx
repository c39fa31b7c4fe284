import { useState } from 'react';
import { Link } from 'react-router-dom';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { FIRST_REFERENCES_PAGE, useAtlasReferences, type ReferencesQuery } from '../api/get-atlas-references';

/** The references behind an atlas page; paged and sorted on the server. */
export function ReferencesTable({ scope, slug }: { scope: 'manipulations' | 'outcomes'; slug: string }) {
  const [q, setQ] = useState<ReferencesQuery>(FIRST_REFERENCES_PAGE);
  const { data, isLoading, error } = useAtlasReferences(scope, slug, q);
  const onSort = (sort: ReferencesQuery['sort'], order: 'asc' | 'desc') => setQ({ ...q, sort, order, page: 1 });
  if (isLoading) return <Loading what="Loading the references" />;
  if (error) return <ErrorNote error={error} />;
  if (!data || data.total === 0) return <EmptyState>No settled effects cite a reference here yet. Contributors code papers from the extraction queue.</EmptyState>;
  return (
    <>
      <table>
        <thead>
          <tr>
            <SortHeader field="label" label="Reference" sort={q.sort} order={q.order} onSort={onSort} />
            <SortHeader field="title" label="Title" sort={q.sort} order={q.order} onSort={onSort} />
            <SortHeader field="year" label="Year" sort={q.sort} order={q.order} onSort={onSort} numeric />
            <th className="num">Studies</th>
            <SortHeader field="effects" label="Effects" sort={q.sort} order={q.order} onSort={onSort} numeric />
            <th>DOI</th>
          </tr>
        </thead>
        <tbody>
          {data.items.map((r) => (
            <tr key={r.id}>
              <td>
                <Link to={`/references/${r.id}`}>{r.label}</Link>
              </td>
              <td className="reading">{r.title}</td>
              <td className="num">{r.year ?? '—'}</td>
              <td className="num">{r.studies}</td>
              <td className="num">{r.effects}</td>
              <td className="text-xs">{r.doi ?? '—'}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <Pager page={q.page} pageSize={q.pageSize} total={data.total} onPage={(page) => setQ({ ...q, page })} />
    </>
  );
}
