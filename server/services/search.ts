import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import type { SearchDeps } from './deps.js';
import type { SearchQuery, SearchResult } from '../../shared/schemas/references.js';
import { AppError } from '../lib/errors.js';
import { REFERENCES_INDEX, SearchUnavailableError, type SearchIndex } from '../adapters/search.js';
import { countLiveRefs, liveRefsAfter, refsForIndex, searchLiveRefs, type RefSearchRow } from '../repositories/refs.js';
import { markIndexStale, readIndexBuild, storeIndexBuild } from '../repositories/search-index-builds.js';
import { readRegistryVersion } from '../repositories/registry-version.js';
import { referencesWithSettledRecords, settledCoverageOf, type SettledCoverage } from '../repositories/settled-effects.js';
import { cslAuthors } from './reference-fields.js';

export class ServiceUnavailableError extends AppError {
  constructor(message: string) {
    super(503, 'search_unavailable', message);
  }
}

const NO_COVERAGE: SettledCoverage = { manipulations: [], outcomes: [], tasks: [], records: [] };

export function referenceDocument(r: RefSearchRow, c: SettledCoverage = NO_COVERAGE) {
  return {
    id: r.id,
    title: r.title,
    title_sort: r.title.toLowerCase(),
    authors: cslAuthors(r.csl),
    year: r.year,
    doi: r.doi,
    container: r.container,
    abstract: typeof r.csl.abstract === 'string' ? r.csl.abstract.slice(0, 4000) : null,
    screening_status: r.screening_status,
    source: r.source,
    created_at: Math.floor(new Date(r.created_at).getTime() / 1000),
    manipulations: c.manipulations.map((m) => m.term),
    manipulation_labels: c.manipulations.map((m) => m.label),
    outcomes: c.outcomes,
    tasks: c.tasks,
    records: c.records,
  };
}

/** The documents of these rows, each with what its settled effects cover. */
async function documentsOf(db: Knex, rows: RefSearchRow[]) {
  const coverage = await settledCoverageOf(db, rows.map((r) => r.id));
  return rows.map((r) => referenceDocument(r, coverage.get(r.id)));
}

/** The shape of the documents above: bump it when referenceDocument changes, and every index is rebuilt. */
export const REFERENCE_DOCUMENT_SCHEMA = 2;

// This process's rebuild of an index, if one runs, and the references changed meanwhile (synced again after it).
const rebuilds = new WeakMap<SearchIndex, Promise<void>>();
const changedDuringRebuild = new WeakMap<SearchIndex, Set<number>>();
// Background work this process started on an index (the check at start, rebuilds): closing waits for it.
const backgroundWork = new WeakMap<SearchIndex, Set<Promise<unknown>>>();

function trackWork<T>(search: SearchIndex, p: Promise<T>): Promise<T> {
  let set = backgroundWork.get(search);
  if (!set) backgroundWork.set(search, (set = new Set()));
  set.add(p);
  void p.finally(() => set.delete(p)).catch(() => undefined);
  return p;
}

/** Resolves once no background work of this process on the index runs (so its database can be closed). */
export async function searchWorkSettled(search: SearchIndex | null | undefined): Promise<void> {
  if (!search) return;
  for (let set = backgroundWork.get(search); set?.size; set = backgroundWork.get(search)) await Promise.allSettled([...set]);
}

/**
 * Brings the index in line with PostgreSQL for these references: live ones are (re)indexed, merged ones
 * removed. A failing index is logged, not fatal: the database is the record, and the index is marked stale so
 * the next search rebuilds it (`npm run search:rebuild` does so by hand).
 */
export async function syncReferences(ctx: SearchDeps, ids: number[]): Promise<void> {
  if (!ctx.search || !ids.length) return;
  const changed = changedDuringRebuild.get(ctx.search);
  if (changed) for (const id of ids) changed.add(id);
  try {
    for (let i = 0; i < ids.length; i += 5000) {
      const rows = await refsForIndex(ctx.db, ids.slice(i, i + 5000));
      const live = rows.filter((r) => r.merged_into == null);
      const gone = ids.slice(i, i + 5000).filter((id) => !live.some((r) => r.id === id));
      await ctx.search.indexDocuments(REFERENCES_INDEX, await documentsOf(ctx.db, live));
      await ctx.search.deleteDocuments(REFERENCES_INDEX, gone);
    }
  } catch (err) {
    console.error('[search] could not update the index; it will be rebuilt:', (err as Error).message);
    await markIndexStale(ctx.db, REFERENCES_INDEX).catch(() => undefined);
  }
}

/**
 * Rebuilds the references index from PostgreSQL (empties it first), then gives it a new build id, kept both in
 * the index and in PostgreSQL: until both agree, searches answer from PostgreSQL.
 */
export async function rebuildReferenceIndex(db: Knex, search: SearchIndex, onProgress?: (done: number, total: number) => void): Promise<number> {
  await markIndexStale(db, REFERENCES_INDEX);
  await search.deleteAll(REFERENCES_INDEX);
  const count = await countLiveRefs(db);
  let done = 0;
  let lastId = 0;
  for (;;) {
    const rows = await liveRefsAfter(db, lastId, 5000);
    if (!rows.length) break;
    await search.indexDocuments(REFERENCES_INDEX, await documentsOf(db, rows));
    done += rows.length;
    lastId = rows[rows.length - 1].id;
    onProgress?.(done, count);
  }
  const build = randomUUID();
  await search.writeBuild(REFERENCES_INDEX, build);
  await storeIndexBuild(db, REFERENCES_INDEX, { build, documentSchema: REFERENCE_DOCUMENT_SCHEMA, documents: done });
  return done;
}

// The registry stamp each index's settled coverage was last brought up to, in this process.
const coverageAt = new WeakMap<SearchIndex, { stamp: string; done: Promise<void> }>();

/**
 * Settling, reopening or withdrawing a record changes what a reference's settled effects cover: when the
 * registry stamp moved since this process last looked, every reference that ever had a settled record is
 * indexed again (once per stamp, however many searches ask).
 */
export async function syncSettledCoverage(ctx: SearchDeps & { search: SearchIndex }): Promise<void> {
  const { stamp } = await readRegistryVersion(ctx.db);
  const known = coverageAt.get(ctx.search);
  if (known?.stamp === stamp) return known.done;
  const done = referencesWithSettledRecords(ctx.db).then((ids) => syncReferences(ctx, ids));
  coverageAt.set(ctx.search, { stamp, done });
  done.catch(() => coverageAt.delete(ctx.search));
  return done;
}

/** Whether the index holds the build PostgreSQL expects, of the current document shape. */
export async function referenceIndexIsCurrent(ctx: SearchDeps & { search: SearchIndex }): Promise<boolean> {
  const [held, expected] = await Promise.all([ctx.search.readBuild(REFERENCES_INDEX), readIndexBuild(ctx.db, REFERENCES_INDEX)]);
  return !!held && !!expected && expected.build === held && expected.documentSchema === REFERENCE_DOCUMENT_SCHEMA;
}

/** Starts a rebuild in the background unless this process already runs one; resolves when it ends. */
export function rebuildInBackground(ctx: SearchDeps & { search: SearchIndex }): Promise<void> {
  const running = rebuilds.get(ctx.search);
  if (running) return running;
  const search = ctx.search;
  const changed = new Set<number>();
  changedDuringRebuild.set(search, changed);
  const started = performance.now();
  const p = rebuildReferenceIndex(ctx.db, search)
    .then(async (n) => {
      changedDuringRebuild.delete(search);
      // A reference changed while its chunk was being read may have been written back as it was: sync it again.
      if (changed.size) await syncReferences(ctx, [...changed]);
      console.log(`[search] rebuilt the references index: ${n} references in ${((performance.now() - started) / 1000).toFixed(1)} s`);
    })
    .catch((err) => console.error('[search] the rebuild failed:', (err as Error).message))
    .finally(() => {
      changedDuringRebuild.delete(search);
      rebuilds.delete(search);
    });
  rebuilds.set(search, p);
  return trackWork(search, p);
}

/** At start: fills an index that does not hold the build the database expects (a fresh or restarted search server). */
export async function ensureReferenceIndex(ctx: SearchDeps): Promise<void> {
  const search = ctx.search;
  if (!search) return;
  const check = async () => {
    if (!(await referenceIndexIsCurrent({ ...ctx, search }))) await rebuildInBackground({ ...ctx, search });
  };
  await trackWork(search, check()).catch((err) => console.error('[search] could not check the index at start:', (err as Error).message));
}

const quote = (s: string) => `"${s.replace(/["\\]/g, '\\$&')}"`;

const REBUILDING_NOTE = 'The search index is being rebuilt; until it is ready these results come from the database (every word matched anywhere, newest first).';
const AWAY_NOTE = 'The search index cannot be reached; these results come from the database (every word matched anywhere, newest first).';

/**
 * Searches the index when it holds the build the database expects; otherwise (empty or stale after a restart
 * of the search server, or while it is being rebuilt) starts a rebuild in the background and answers from
 * PostgreSQL meanwhile; likewise while the search server cannot be reached.
 */
export async function searchReferences(ctx: SearchDeps, q: SearchQuery): Promise<SearchResult> {
  const search = ctx.search;
  if (!search) throw new ServiceUnavailableError('Search is not configured on this server (MEILI_HOST is not set).');
  const filter: string[] = [];
  if (q.yearFrom !== undefined) filter.push(`year >= ${q.yearFrom}`);
  if (q.yearTo !== undefined) filter.push(`year <= ${q.yearTo}`);
  if (q.status) filter.push(`screening_status = ${quote(q.status)}`);
  if (q.manipulation) filter.push(`manipulations = ${quote(q.manipulation)}`);
  if (q.outcome) filter.push(`outcomes = ${quote(q.outcome)}`);
  if (q.task) filter.push(`tasks = ${quote(q.task)}`);
  // a settled-data change since the last search re-indexes what the references' settled effects cover
  await syncSettledCoverage({ ...ctx, search }).catch((err) => console.error('[search] could not bring settled coverage up to date:', (err as Error).message));
  // The check and the search run together, so a current index costs no extra wait.
  const [current, found] = await Promise.allSettled([
    referenceIndexIsCurrent({ ...ctx, search }),
    search.search<ReturnType<typeof referenceDocument>>(REFERENCES_INDEX, q.q, {
      filter: filter.length ? filter.join(' AND ') : undefined,
      facets: ['screening_status', 'year'],
      limit: q.limit,
      offset: q.offset,
    }),
  ]);
  const away = [current, found].some((r) => r.status === 'rejected' && r.reason instanceof SearchUnavailableError);
  if (away) return searchDatabase(ctx.db, q, AWAY_NOTE);
  if (current.status === 'rejected') throw current.reason;
  if (found.status === 'rejected') throw found.reason;
  if (!current.value) {
    void rebuildInBackground({ ...ctx, search });
    return searchDatabase(ctx.db, q, REBUILDING_NOTE);
  }
  const res = found.value;
  const facets = res.facetDistribution ?? {};
  return {
    hits: res.hits.map((h) => ({
      id: Number(h.id),
      title: h.title,
      year: h.year ?? null,
      authors: h.authors ?? [],
      doi: h.doi ?? null,
      container: h.container ?? null,
      screeningStatus: h.screening_status,
      manipulations: (h.manipulations ?? []).map((term, i) => ({ term, label: h.manipulation_labels?.[i] ?? term })),
      outcomes: h.outcomes ?? [],
      tasks: h.tasks ?? [],
      records: h.records ?? [],
    })),
    total: res.estimatedTotalHits ?? (res as { totalHits?: number }).totalHits ?? res.hits.length,
    facets: { screening_status: facets.screening_status ?? {}, year: facets.year ?? {} },
    processingTimeMs: res.processingTimeMs,
    source: 'index',
  };
}

async function searchDatabase(db: Knex, q: SearchQuery, note: string): Promise<SearchResult> {
  const t0 = performance.now();
  const words = q.q.split(/[^\p{L}\p{N}./-]+/u).filter(Boolean).slice(0, 20);
  const { rows, total, facets } = await searchLiveRefs(db, { words, yearFrom: q.yearFrom, yearTo: q.yearTo, status: q.status, manipulation: q.manipulation, outcome: q.outcome, task: q.task }, q);
  const coverage = await settledCoverageOf(db, rows.map((r) => r.id));
  return {
    hits: rows.map((r) => {
      const d = referenceDocument(r);
      const c = coverage.get(r.id) ?? NO_COVERAGE;
      return { id: d.id, title: d.title, year: d.year ?? null, authors: d.authors, doi: d.doi ?? null, container: d.container ?? null, screeningStatus: d.screening_status, ...c };
    }),
    total,
    facets,
    processingTimeMs: Math.round(performance.now() - t0),
    source: 'database',
    note,
  };
}
