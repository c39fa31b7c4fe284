import type { Knex } from 'knex';
import type { SearchDeps } from './deps.js';
import type { SearchQuery, SearchResult } from '../../shared/schemas/references.js';
import { AppError } from '../lib/errors.js';
import { REFERENCES_INDEX, SearchUnavailableError, type SearchIndex } from '../adapters/search.js';
import { countLiveRefs, liveRefsAfter, refsForIndex, type RefSearchRow } from '../repositories/refs.js';
import { cslAuthors } from './reference-fields.js';

export class ServiceUnavailableError extends AppError {
  constructor(message: string) {
    super(503, 'search_unavailable', message);
  }
}

export function referenceDocument(r: RefSearchRow) {
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
  };
}

/**
 * Brings the index in line with PostgreSQL for these references: live ones are (re)indexed, merged ones
 * removed. A failing index is logged, not fatal: the database is the record and `npm run search:rebuild`
 * (or the next start) repairs the index.
 */
export async function syncReferences(ctx: SearchDeps, ids: number[]): Promise<void> {
  if (!ctx.search || !ids.length) return;
  try {
    for (let i = 0; i < ids.length; i += 5000) {
      const rows = await refsForIndex(ctx.db, ids.slice(i, i + 5000));
      const live = rows.filter((r) => r.merged_into == null);
      const gone = ids.slice(i, i + 5000).filter((id) => !live.some((r) => r.id === id));
      await ctx.search.indexDocuments(REFERENCES_INDEX, live.map(referenceDocument));
      await ctx.search.deleteDocuments(REFERENCES_INDEX, gone);
    }
  } catch (err) {
    console.error('[search] could not update the index:', (err as Error).message);
  }
}

/** Rebuilds the references index from PostgreSQL (empties it first). */
export async function rebuildReferenceIndex(db: Knex, search: SearchIndex, onProgress?: (done: number, total: number) => void): Promise<number> {
  await search.deleteAll(REFERENCES_INDEX);
  const count = await countLiveRefs(db);
  let done = 0;
  let lastId = 0;
  for (;;) {
    const rows = await liveRefsAfter(db, lastId, 5000);
    if (!rows.length) break;
    await search.indexDocuments(REFERENCES_INDEX, rows.map(referenceDocument));
    done += rows.length;
    lastId = rows[rows.length - 1].id;
    onProgress?.(done, count);
  }
  return done;
}

/** At start: fills an index that does not hold what the database holds (a fresh or restarted search server). */
export async function ensureReferenceIndex(ctx: SearchDeps): Promise<void> {
  if (!ctx.search) return;
  try {
    if ((await ctx.search.count(REFERENCES_INDEX)) !== (await countLiveRefs(ctx.db))) await rebuildReferenceIndex(ctx.db, ctx.search);
  } catch (err) {
    console.error('[search] could not fill the index at start:', (err as Error).message);
  }
}

const quote = (s: string) => `"${s.replace(/["\\]/g, '\\$&')}"`;

export async function searchReferences(search: SearchIndex | null, q: SearchQuery): Promise<SearchResult> {
  if (!search) throw new ServiceUnavailableError('Search is not configured on this server (MEILI_HOST is not set).');
  const filter: string[] = [];
  if (q.yearFrom !== undefined) filter.push(`year >= ${q.yearFrom}`);
  if (q.yearTo !== undefined) filter.push(`year <= ${q.yearTo}`);
  if (q.status) filter.push(`screening_status = ${quote(q.status)}`);
  try {
    const res = await search.search<ReturnType<typeof referenceDocument>>(REFERENCES_INDEX, q.q, {
      filter: filter.length ? filter.join(' AND ') : undefined,
      facets: ['screening_status', 'year'],
      limit: q.limit,
      offset: q.offset,
    });
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
      })),
      total: res.estimatedTotalHits ?? (res as { totalHits?: number }).totalHits ?? res.hits.length,
      facets: { screening_status: facets.screening_status ?? {}, year: facets.year ?? {} },
      processingTimeMs: res.processingTimeMs,
    };
  } catch (err) {
    if (err instanceof SearchUnavailableError) throw new ServiceUnavailableError(err.message);
    throw err;
  }
}
