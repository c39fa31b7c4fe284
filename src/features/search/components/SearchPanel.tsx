import { useCallback, useEffect, useState } from 'react';
import { useForm, useWatch } from 'react-hook-form';
import { Link, useSearchParams } from 'react-router-dom';
import { SCREENING_STATUSES } from '../../../../shared/vocabulary/screening';
import { OUTCOME_KINDS } from '../../../../shared/vocabulary/outcomes';
import { TASKS } from '../../../../shared/vocabulary/tasks';
import { labelOf } from '../../../../shared/vocabulary/labels';
import { Field } from '../../../components/ui/Field';
import { Caution, EmptyState, ErrorNote, Loading } from '../../../components/ui/Notice';
import { formResolver } from '../../../lib/forms/resolver';
import { Pager } from '../../../components/ui/Pager';
import { useSearch } from '../api/search-references';
import { pageFromParams, searchFormSchema, searchParams, searchValuesFromParams, type SearchFilters, type SearchValues } from '../forms/search-form';

const input = 'rounded border border-paper-edge bg-white px-2 py-1 text-sm';
const STATUS_WORDS: Record<string, string> = { unscreened: '○ unscreened', awaiting_full_text: '◐ awaiting full text', included: '✓ included', excluded: '✕ excluded' };

/** A manipulation to offer as a filter (the route page passes the vocabulary). */
export interface ManipulationChoice {
  term: string;
  label: string;
}

/**
 * Search over the index, with the filters and counts in the address so a search can be shared; a reference
 * with settled effects links to its atlas pages and its settled records.
 */
export function SearchPanel({ manipulations = [] }: { manipulations?: ManipulationChoice[] }) {
  const [params, setParams] = useSearchParams();
  const form = useForm({ resolver: formResolver(searchFormSchema), defaultValues: searchValuesFromParams(params), mode: 'onChange' });
  const { errors } = form.formState;
  const values = useWatch({ control: form.control }) as SearchValues;
  // The inputs own the state (so a click shows at once); the search and the address follow the valid values.
  const [filters, setFilters] = useState<SearchFilters>(() => searchFormSchema.safeParse(form.getValues()).data ?? { q: '' });
  const [applied, setApplied] = useState<SearchValues>(() => form.getValues());
  const [page, setPage] = useState(() => pageFromParams(params));
  const limit = 20;
  const apply = useCallback((v: SearchValues) => {
    const parsed = searchFormSchema.safeParse(v);
    if (!parsed.success) return;
    setFilters(parsed.data);
    setApplied(v);
    setPage(1);
  }, []);
  useEffect(() => {
    if (JSON.stringify(values) === JSON.stringify(applied)) return;
    // Words wait for a pause in typing; a ticked filter applies at once.
    const t = setTimeout(() => apply(values), values.q !== applied.q ? 250 : 0);
    return () => clearTimeout(t);
  }, [values, applied, apply]);
  useEffect(() => {
    const next = searchParams(applied, page);
    if (next.toString() !== params.toString()) setParams(next, { replace: true });
  }, [applied, page, params, setParams]);
  const { data, error, isLoading, isFetching } = useSearch({ ...filters, limit, offset: (page - 1) * limit });
  const q = filters.q;
  const setYears = (y: string) => {
    form.setValue('yearFrom', y, { shouldValidate: true });
    form.setValue('yearTo', y, { shouldValidate: true });
  };
  const years = Object.entries(data?.facets.year ?? {}).sort(([a], [b]) => Number(b) - Number(a));
  return (
    <div className="grid gap-4 md:grid-cols-[16rem_minmax(0,1fr)]">
      <aside aria-label="Filters" className="text-sm">
        <form role="search" aria-label="Search references" noValidate onSubmit={form.handleSubmit(() => apply(form.getValues()))}>
          <Field label="Words in title, authors, journal or DOI" error={errors.q?.message} className="mb-2 block" labelClassName="block">
            <input className={`${input} mt-0.5 w-full`} type="search" {...form.register('q')} placeholder="e.g. looming Varga" autoFocus />
          </Field>
          <div className="mb-2 flex gap-2">
            <Field label="From" error={errors.yearFrom?.message} className="" labelClassName="block">
              <input className={`${input} block w-20`} inputMode="numeric" {...form.register('yearFrom')} />
            </Field>
            <Field label="To" error={errors.yearTo?.message} className="" labelClassName="block">
              <input className={`${input} block w-20`} inputMode="numeric" {...form.register('yearTo')} />
            </Field>
          </div>
          <p className="mb-1 text-xs text-ink-soft">What its settled effects cover</p>
          <Field label="Manipulation" error={errors.manipulation?.message} className="mb-2 block" labelClassName="block">
            <select className={`${input} mt-0.5 w-full`} {...form.register('manipulation')}>
              <option value="">any manipulation</option>
              {manipulations.map((m) => (
                <option key={m.term} value={m.term}>
                  {m.label}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Outcome kind" error={errors.outcome?.message} className="mb-2 block" labelClassName="block">
            <select className={`${input} mt-0.5 w-full`} {...form.register('outcome')}>
              <option value="">any outcome kind</option>
              {OUTCOME_KINDS.map((o) => (
                <option key={o} value={o}>
                  {labelOf('outcome', o)}
                </option>
              ))}
            </select>
          </Field>
          <Field label="Task" error={errors.task?.message} className="mb-2 block" labelClassName="block">
            <select className={`${input} mt-0.5 w-full`} {...form.register('task')}>
              <option value="">any task</option>
              {TASKS.map((k) => (
                <option key={k} value={k}>
                  {labelOf('task', k)}
                </option>
              ))}
            </select>
          </Field>
          <fieldset className="mb-3">
            <legend className="font-semibold">Screening</legend>
            <label className="flex items-center gap-1">
              <input type="radio" value="" {...form.register('status')} /> any
            </label>
            {SCREENING_STATUSES.map((s) => (
              <label key={s} className="flex items-center gap-1">
                <input type="radio" value={s} {...form.register('status')} /> {STATUS_WORDS[s]}{' '}
                <span className="ml-auto tabular-nums text-ink-faint">{data?.facets.screening_status[s] ?? 0}</span>
              </label>
            ))}
          </fieldset>
        </form>
        {years.length > 0 && (
          <div>
            <p className="font-semibold">Years in these results</p>
            <ul className="max-h-64 overflow-auto">
              {years.map(([y, n]) => (
                <li key={y} className="flex">
                  <button type="button" className="underline" onClick={() => setYears(y)}>
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
        {data?.source === 'database' && <Caution title="Simpler search for now">{data.note}</Caution>}
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
                {h.records.length > 0 && (
                  <div className="mt-0.5 flex flex-wrap gap-x-3 text-sm" aria-label={`Settled data of ${h.title}`}>
                    {h.manipulations.map((m) => (
                      <Link key={m.term} to={`/atlas/manipulations/${m.term}`}>
                        Atlas: {m.label}
                      </Link>
                    ))}
                    {h.records.map((r, i) => (
                      <Link key={r} to={`/records/${r}`}>
                        ✓ Settled record{h.records.length > 1 ? ` ${i + 1}` : ''}
                      </Link>
                    ))}
                    <span className="text-ink-faint">{[...h.outcomes.map((o) => labelOf('outcome', o)), ...h.tasks.map((k) => labelOf('task', k))].join(' · ')}</span>
                  </div>
                )}
              </li>
            ))}
          </ol>
        )}
        {data && data.total > limit && <Pager page={page} pageSize={limit} total={Math.min(data.total, 10_000)} onPage={setPage} />}
      </section>
    </div>
  );
}
