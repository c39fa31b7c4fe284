import { useEffect, useState } from 'react';
import { Link, useSearchParams } from 'react-router-dom';
import { SCREENING_STATUSES } from '../../../../shared/vocabulary/screening';
import { EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { Pager } from '../../../components/ui/Pager';
import { useSearch } from '../api/search-references';

const input = 'rounded border border-paper-edge bg-white px-2 py-1 text-sm';
const STATUS_WORDS: Record<string, string> = { unscreened: '○ unscreened', included: '✓ included', excluded: '✕ excluded' };

/** Search over the index, with the filters and counts in the address so a search can be shared. */
export function SearchPanel() {
  const [params, setParams] = useSearchParams();
  // The inputs own the state (so a click shows at once); the address follows, so a search can be shared.
  const [typed, setTyped] = useState(params.get('q') ?? '');
  const [q, setQ] = useState(params.get('q') ?? '');
  const [status, setStatus] = useState(params.get('status') ?? '');
  const [yearFrom, setYearFrom] = useState(params.get('yearFrom') ?? '');
  const [yearTo, setYearTo] = useState(params.get('yearTo') ?? '');
  const [page, setPage] = useState(Number(params.get('page') ?? 1) || 1);
  const limit = 20;
  const set = (patch: { q?: string; status?: string; yearFrom?: string; yearTo?: string; page?: string }) => {
    if (patch.q !== undefined) setQ(patch.q);
    if (patch.status !== undefined) setStatus(patch.status);
    if (patch.yearFrom !== undefined) setYearFrom(patch.yearFrom);
    if (patch.yearTo !== undefined) setYearTo(patch.yearTo);
    setPage(patch.page ? Number(patch.page) : 1);
  };
  useEffect(() => {
    const t = setTimeout(() => typed !== q && set({ q: typed }), 250);
    return () => clearTimeout(t);
  });
  useEffect(() => {
    const next = new URLSearchParams();
    for (const [k, v] of Object.entries({ q, status, yearFrom, yearTo, page: page > 1 ? String(page) : '' })) if (v) next.set(k, v);
    if (next.toString() !== params.toString()) setParams(next, { replace: true });
  }, [q, status, yearFrom, yearTo, page, params, setParams]);
  const year = (s: string) => (/^\d{4}$/.test(s) ? Number(s) : undefined);
  const { data, error, isLoading, isFetching } = useSearch({
    q,
    status: (status || undefined) as never,
    yearFrom: year(yearFrom),
    yearTo: year(yearTo),
    limit,
    offset: (page - 1) * limit,
  });
  const years = Object.entries(data?.facets.year ?? {}).sort(([a], [b]) => Number(b) - Number(a));
  const badYear = (yearFrom && !year(yearFrom)) || (yearTo && !year(yearTo));
  return (
    <div className="grid gap-4 md:grid-cols-[16rem_1fr]">
      <aside aria-label="Filters" className="text-sm">
        <label className="mb-2 block">
          Words in title, authors, journal or DOI
          <input className={`${input} mt-0.5 w-full`} type="search" value={typed} onChange={(e) => setTyped(e.target.value)} placeholder="e.g. looming Varga" autoFocus />
        </label>
        <div className="mb-2 flex gap-2">
          <label>
            From
            <input className={`${input} block w-20`} inputMode="numeric" value={yearFrom} onChange={(e) => set({ yearFrom: e.target.value })} aria-invalid={!!yearFrom && !year(yearFrom)} />
          </label>
          <label>
            To
            <input className={`${input} block w-20`} inputMode="numeric" value={yearTo} onChange={(e) => set({ yearTo: e.target.value })} aria-invalid={!!yearTo && !year(yearTo)} />
          </label>
        </div>
        {badYear && <p className="mb-2 text-refusal">✕ A year has four digits.</p>}
        <fieldset className="mb-3">
          <legend className="font-semibold">Screening</legend>
          <label className="flex items-center gap-1">
            <input type="radio" name="status" checked={!status} onChange={() => set({ status: '' })} /> any
          </label>
          {SCREENING_STATUSES.map((s) => (
            <label key={s} className="flex items-center gap-1">
              <input type="radio" name="status" checked={status === s} onChange={() => set({ status: s })} /> {STATUS_WORDS[s]}{' '}
              <span className="ml-auto tabular-nums text-ink-faint">{data?.facets.screening_status[s] ?? 0}</span>
            </label>
          ))}
        </fieldset>
        {years.length > 0 && (
          <div>
            <p className="font-semibold">Years in these results</p>
            <ul className="max-h-64 overflow-auto">
              {years.map(([y, n]) => (
                <li key={y} className="flex">
                  <button type="button" className="underline" onClick={() => set({ yearFrom: y, yearTo: y })}>
                    {y}
                  </button>
                  <span className="ml-auto tabular-nums text-ink-faint">{n}</span>
                </li>
              ))}
            </ul>
          </div>
        )}
      </aside>
      <section aria-label="Results">
        <ErrorNote error={error} title={(error as { status?: number } | null)?.status === 503 ? 'Search unavailable' : 'Refused'} />
        {isLoading && <Loading what="Searching" />}
        {data && (
          <p role="status" className="mb-2 text-sm text-ink-soft">
            {data.total} {data.total === 1 ? 'reference' : 'references'}
            {q ? ` for “${q}”` : ''}
            {isFetching ? ' · updating…' : ''}
          </p>
        )}
        {data && data.total === 0 && <EmptyState>Nothing matches. Try fewer words, another spelling, or clear the year range.</EmptyState>}
        {data && data.hits.length > 0 && (
          <ol className="grid gap-2" start={(page - 1) * limit + 1}>
            {data.hits.map((h) => (
              <li key={h.id} className="border-b border-paper-edge pb-2">
                <Link to={`/references/${h.id}`} className="font-semibold">
                  {h.title}
                </Link>
                <div className="text-sm text-ink-soft">
                  {h.authors.slice(0, 4).join(', ')}
                  {h.authors.length > 4 ? ' et al.' : ''} · <span className="tabular-nums">{h.year ?? 'n.d.'}</span>
                  {h.container ? ` · ${h.container}` : ''}
                  {h.doi ? ` · doi:${h.doi}` : ''} · {STATUS_WORDS[h.screeningStatus] ?? h.screeningStatus}
                </div>
              </li>
            ))}
          </ol>
        )}
        {data && data.total > limit && <Pager page={page} pageSize={limit} total={Math.min(data.total, 10_000)} onPage={(p) => set({ page: String(p) })} />}
      </section>
    </div>
  );
}
