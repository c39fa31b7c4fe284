import { useState } from 'react';
import { Link } from 'react-router-dom';
import { SCREENING_STATUSES } from '../../../../shared/vocabulary/screening';
import type { ReferenceListQuery } from '../../../../shared/schemas/references';
import { Button } from '../../../components/ui/Button';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { exportHref } from '../api/export-references';
import { useReferences } from '../api/get-references';
import { ScreeningStatusWord } from './StatusWord';

type Sort = ReferenceListQuery['sort'];
const input = 'rounded border border-paper-edge bg-white px-2 py-1 text-sm';

export function ReferencesTable({ batch }: { batch?: number }) {
  const [q, setQ] = useState('');
  const [status, setStatus] = useState<'' | ReferenceListQuery['status']>('');
  const [yearFrom, setYearFrom] = useState('');
  const [yearTo, setYearTo] = useState('');
  const [page, setPage] = useState(1);
  const [sort, setSort] = useState<Sort>('created_at');
  const [order, setOrder] = useState<'asc' | 'desc'>('desc');
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const pageSize = 50;
  const year = (s: string) => (/^\d{4}$/.test(s) ? Number(s) : undefined);
  const { data, error, isLoading, isFetching } = useReferences({
    q: q || undefined,
    status: status || undefined,
    yearFrom: year(yearFrom),
    yearTo: year(yearTo),
    batch,
    page,
    pageSize,
    sort,
    order,
  });
  const onSort = (f: Sort, o: 'asc' | 'desc') => {
    setSort(f);
    setOrder(o);
    setPage(1);
  };
  const reset = <T,>(set: (v: T) => void) => (v: T) => {
    set(v);
    setPage(1);
  };
  const toggle = (id: number) =>
    setSelected((s) => {
      const next = new Set(s);
      if (next.has(id)) next.delete(id);
      else next.add(id);
      return next;
    });
  const pageIds = data?.items.map((r) => r.id) ?? [];
  const allOnPage = pageIds.length > 0 && pageIds.every((id) => selected.has(id));
  const ids = [...selected];
  return (
    <div>
      <form className="mb-3 flex flex-wrap items-end gap-3 text-sm" role="search" onSubmit={(e) => e.preventDefault()}>
        <label className="flex flex-col">
          Title, author, DOI or journal
          <input className={input} value={q} onChange={(e) => reset(setQ)(e.target.value)} placeholder="e.g. looming" />
        </label>
        <label className="flex flex-col">
          Screening
          <select className={input} value={status} onChange={(e) => reset(setStatus)(e.target.value as typeof status)}>
            <option value="">any</option>
            {SCREENING_STATUSES.map((s) => (
              <option key={s} value={s}>
                {s}
              </option>
            ))}
          </select>
        </label>
        <label className="flex flex-col">
          Year from
          <input className={`${input} w-20`} inputMode="numeric" value={yearFrom} onChange={(e) => reset(setYearFrom)(e.target.value)} aria-invalid={!!yearFrom && !year(yearFrom)} />
        </label>
        <label className="flex flex-col">
          Year to
          <input className={`${input} w-20`} inputMode="numeric" value={yearTo} onChange={(e) => reset(setYearTo)(e.target.value)} aria-invalid={!!yearTo && !year(yearTo)} />
        </label>
        {((yearFrom && !year(yearFrom)) || (yearTo && !year(yearTo))) && <span className="text-refusal">✕ A year has four digits.</span>}
        {isFetching && !isLoading && <span className="text-ink-faint">Updating…</span>}
      </form>
      <div className="mb-2 flex flex-wrap items-center gap-2 text-sm">
        <span className="tabular-nums">{selected.size} selected</span>
        {selected.size > 0 ? (
          <>
            <a className="rounded border border-paper-edge bg-white/60 px-3 py-1" href={exportHref(ids, 'bibtex')} download>
              Export BibTeX
            </a>
            <a className="rounded border border-paper-edge bg-white/60 px-3 py-1" href={exportHref(ids, 'csl-json')} download>
              Export CSL-JSON
            </a>
            <Button onClick={() => setSelected(new Set())}>Clear selection</Button>
          </>
        ) : (
          <span className="text-ink-faint">Tick references to export them as BibTeX or CSL-JSON.</span>
        )}
      </div>
      <ErrorNote error={error} />
      {isLoading && <Loading what="Loading references" />}
      {data && data.total === 0 && (
        <EmptyState>
          No references match. {q || status || yearFrom || yearTo ? 'Loosen the filters, or ' : ''}
          <Link to="/import">import a BibTeX, RIS or DOI list</Link>.
        </EmptyState>
      )}
      {data && data.total > 0 && (
        <>
          <table>
            <thead>
              <tr>
                <th>
                  <input
                    type="checkbox"
                    aria-label="Select every reference on this page"
                    checked={allOnPage}
                    onChange={() => setSelected((s) => new Set(allOnPage ? [...s].filter((id) => !pageIds.includes(id)) : [...s, ...pageIds]))}
                  />
                </th>
                <SortHeader field="title" label="Title" sort={sort} order={order} onSort={onSort} />
                <SortHeader field="first_author" label="First author" sort={sort} order={order} onSort={onSort} />
                <SortHeader field="year" label="Year" sort={sort} order={order} onSort={onSort} numeric />
                <SortHeader field="container" label="Journal" sort={sort} order={order} onSort={onSort} />
                <SortHeader field="screening_status" label="Screening" sort={sort} order={order} onSort={onSort} />
                <SortHeader field="created_at" label="Added" sort={sort} order={order} onSort={onSort} numeric />
              </tr>
            </thead>
            <tbody>
              {data.items.map((r) => (
                <tr key={r.id}>
                  <td>
                    <input type="checkbox" aria-label={`Select reference ${r.id}`} checked={selected.has(r.id)} onChange={() => toggle(r.id)} />
                  </td>
                  <td>
                    <Link to={`/references/${r.id}`}>{r.title}</Link>
                  </td>
                  <td>{r.firstAuthor ?? '—'}</td>
                  <td className="num">{r.year ?? '—'}</td>
                  <td>{r.container ?? '—'}</td>
                  <td>
                    <ScreeningStatusWord status={r.screeningStatus} />
                  </td>
                  <td className="num">{r.createdAt.slice(0, 10)}</td>
                </tr>
              ))}
            </tbody>
          </table>
          <Pager page={page} pageSize={pageSize} total={data.total} onPage={setPage} />
        </>
      )}
    </div>
  );
}
