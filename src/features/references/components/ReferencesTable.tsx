import { useEffect, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Link } from 'react-router-dom';
import { SCREENING_STATUSES } from '../../../../shared/vocabulary/screening';
import type { ReferenceListQuery } from '../../../../shared/schemas/references';
import { Button } from '../../../components/ui/Button';
import { Field } from '../../../components/ui/Field';
import { formResolver } from '../../../lib/forms/resolver';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { SortHeader } from '../../../components/ui/SortHeader';
import { exportHref } from '../api/export-references';
import { FIRST_REFERENCES_PAGE, firstReferencesQuery, useReferences } from '../api/get-references';
import { NO_FILTERS, referenceFiltersSchema, type ReferenceFilterValues } from '../forms/reference-filters';
import { ScreeningStatusWord } from './StatusWord';
import { labelOf } from '../../../../shared/vocabulary/labels';

type Sort = ReferenceListQuery['sort'];
const input = 'rounded border border-paper-edge bg-white px-2 py-1 text-sm';

export function ReferencesTable({ batch }: { batch?: number }) {
  const form = useForm({ resolver: formResolver(referenceFiltersSchema), defaultValues: NO_FILTERS, mode: 'onChange' });
  const { errors } = form.formState;
  const values = useWatch({ control: form.control }) as ReferenceFilterValues;
  // The last valid filters stay in force while a year is half typed.
  const [filters, setFilters] = useState<Partial<ReferenceListQuery>>({});
  const [page, setPage] = useState<number>(FIRST_REFERENCES_PAGE.page);
  const [sort, setSort] = useState<Sort>(FIRST_REFERENCES_PAGE.sort);
  const [order, setOrder] = useState<'asc' | 'desc'>(FIRST_REFERENCES_PAGE.order);
  const [selected, setSelected] = useState<Set<number>>(new Set());
  const pageSize = FIRST_REFERENCES_PAGE.pageSize;
  useEffect(() => {
    const parsed = referenceFiltersSchema.safeParse(values);
    if (!parsed.success) return;
    if (JSON.stringify(parsed.data) === JSON.stringify(filters)) return;
    setFilters(parsed.data);
    setPage(1);
  }, [values, filters]);
  const { data, error, isLoading, isFetching } = useReferences({ ...firstReferencesQuery(batch), ...filters, page, pageSize, sort, order });
  const filtered = Object.values(filters).some((v) => v !== undefined);
  const onSort = (f: Sort, o: 'asc' | 'desc') => {
    setSort(f);
    setOrder(o);
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
      <form className="mb-3 flex flex-wrap items-start gap-3 text-sm" role="search" noValidate onSubmit={(e) => e.preventDefault()}>
        <Field label="Title, author, DOI or journal" error={errors.q?.message} className="flex flex-col" labelClassName="">
          <input className={input} {...form.register('q')} placeholder="e.g. looming" />
        </Field>
        <Field label="Screening" error={errors.status?.message} className="flex flex-col" labelClassName="">
          <select className={input} {...form.register('status')}>
            <option value="">any</option>
            {SCREENING_STATUSES.map((s) => (
              <option key={s} value={s}>
                {labelOf('screening', s)}
              </option>
            ))}
          </select>
        </Field>
        <Field label="Year from" error={errors.yearFrom?.message} className="flex flex-col" labelClassName="">
          <input className={`${input} w-20`} inputMode="numeric" {...form.register('yearFrom')} />
        </Field>
        <Field label="Year to" error={errors.yearTo?.message} className="flex flex-col" labelClassName="">
          <input className={`${input} w-20`} inputMode="numeric" {...form.register('yearTo')} />
        </Field>
        {isFetching && !isLoading && <span className="self-end text-ink-faint">Updating…</span>}
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
          No references match. {filtered ? 'Loosen the filters, or ' : ''}
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
