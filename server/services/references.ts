import type { Knex } from 'knex';
import { authorKey, cleanCsl, refColumns, type Csl } from './reference-fields.js';

type Db = Knex | Knex.Transaction;

export interface CreateReferenceOptions {
  /** Where the record came from: 'bibtex' | 'ris' | 'doi' | 'manual' | 'seed' … (PRISMA "records identified" per source). */
  source: string;
  createdBy?: number | null;
}

export interface CreateReferenceResult {
  id: number;
  /** false when an exact duplicate already existed: nothing was written and `id` is that reference. */
  created: boolean;
  /** A live reference with the same title key, year and first author but not provably the same record. */
  likelyDuplicateOf?: number;
}

/** Thrown when a CSL record lacks what the registry needs (a title). */
export class ReferenceInputError extends Error {
  constructor(
    readonly field: string,
    message: string,
  ) {
    super(message);
  }
}

/**
 * Finds the live reference a record duplicates. Exact: the same DOI; or the same title key, year and first
 * author when neither side has a DOI (nothing could tell them apart). Likely: the same title key, year and
 * first author where one side has a DOI the other lacks or they differ — offered to a curator, never merged here.
 */
export async function findDuplicate(db: Db, cols: ReturnType<typeof refColumns>): Promise<{ exact?: number; likely?: number }> {
  if (cols.doi) {
    const byDoi = await db('refs').where({ doi: cols.doi }).first('id', 'merged_into');
    if (byDoi) return { exact: byDoi.merged_into ?? byDoi.id };
  }
  if (!cols.title_key) return {};
  const same = await db('refs')
    .whereNull('merged_into')
    .where({ title_key: cols.title_key })
    .modify((qb) => (cols.year == null ? qb.whereNull('year') : qb.where('year', cols.year)))
    .select('id', 'doi', 'first_author')
    .orderBy('id');
  const ak = authorKey(cols.first_author);
  const matches = same.filter((r: { first_author: string | null }) => authorKey(r.first_author) === ak);
  if (!matches.length) return {};
  if (!cols.doi) {
    const noDoi = matches.find((r: { doi: string | null }) => !r.doi);
    if (noDoi) return { exact: noDoi.id };
  }
  return { likely: matches[0].id };
}

/** Records a likely-duplicate pair for the curators' list (ordered so each pair is stored once). */
export async function offerDuplicate(db: Db, a: number, b: number, reason: string): Promise<void> {
  if (a === b) return;
  const [refA, refB] = a < b ? [a, b] : [b, a];
  await db('ref_duplicate_candidates').insert({ ref_a: refA, ref_b: refB, reason }).onConflict(['ref_a', 'ref_b']).ignore();
}

/**
 * Creates a reference from CSL-JSON, computing doi/title/year/first_author/container/title_key.
 * Idempotent for exact duplicates (returns the existing id with created=false), so seeds may call it on
 * every start. Pass the caller's transaction. Does not touch the search index (callers index after commit;
 * the server re-indexes everything at start).
 */
export async function createReference(db: Db, csl: Csl, opts: CreateReferenceOptions): Promise<CreateReferenceResult> {
  const clean = cleanCsl(csl);
  const cols = refColumns(clean);
  if (!cols.title) throw new ReferenceInputError('title', 'field title is missing');
  const dup = await findDuplicate(db, cols);
  if (dup.exact) return { id: dup.exact, created: false };
  const [row] = await db('refs')
    .insert({ csl: JSON.stringify(clean), ...cols, source: opts.source, created_by: opts.createdBy ?? null })
    .returning('id');
  if (dup.likely) await offerDuplicate(db, dup.likely, row.id, 'same title, year and first author');
  return { id: row.id, created: true, ...(dup.likely ? { likelyDuplicateOf: dup.likely } : {}) };
}
