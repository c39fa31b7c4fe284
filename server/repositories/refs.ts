import type { Knex } from 'knex';
import type { Csl } from '../adapters/citations.js';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import { whereSettledCovers } from './settled-effects.js';
import type { AttachmentRow, DuplicateCandidateRow, RefRow, ScreeningStatus } from './rows.js';

/** The columns computed from a reference's CSL-JSON (see services/reference-fields.ts). */
export type RefColumns = Pick<RefRow, 'doi' | 'title' | 'year' | 'first_author' | 'container' | 'title_key'>;

const SUMMARY_COLUMNS = ['id', 'csl', 'title', 'year', 'first_author', 'container', 'doi', 'source', 'screening_status', 'merged_into', 'version', 'created_at', 'updated_at', 'created_by'] as const;
export type RefSummaryRow = Pick<RefRow, (typeof SUMMARY_COLUMNS)[number]>;

export async function findRef(db: Db, id: number): Promise<RefRow | undefined> {
  return db<RefRow>('refs').where({ id }).first();
}

/** Locks a reference row for the rest of the transaction. */
export async function lockRef(trx: Knex.Transaction, id: number): Promise<RefRow | undefined> {
  return trx<RefRow>('refs').where({ id }).forUpdate().first();
}

export async function lockRefs(trx: Knex.Transaction, ids: number[]): Promise<RefRow[]> {
  return trx<RefRow>('refs').whereIn('id', ids).forUpdate().select('*');
}

export async function findRefWithCreator(db: Db, id: number): Promise<(RefRow & { created_by_login: string | null }) | undefined> {
  return db('refs').leftJoin('users', 'users.id', 'refs.created_by').where('refs.id', id).first('refs.*', 'users.login as created_by_login');
}

export async function refsByIds(db: Db, ids: number[]): Promise<RefSummaryRow[]> {
  return ids.length ? db<RefRow>('refs').whereIn('id', ids).select(SUMMARY_COLUMNS) : [];
}

/** The reference that holds a DOI (merged ones too). */
export async function findRefByDoi(db: Db, doi: string): Promise<Pick<RefRow, 'id' | 'merged_into'> | undefined> {
  return db<RefRow>('refs').where({ doi }).first('id', 'merged_into');
}

export async function otherRefWithDoi(db: Db, doi: string, notId: number): Promise<Pick<RefRow, 'id'> | undefined> {
  return db<RefRow>('refs').where({ doi }).whereNot({ id: notId }).first('id');
}

/** Live references with this title key and year, oldest first. */
export async function liveRefsWithTitle(db: Db, titleKey: string, year: number | null): Promise<Pick<RefRow, 'id' | 'doi' | 'first_author'>[]> {
  return db<RefRow>('refs')
    .whereNull('merged_into')
    .where({ title_key: titleKey })
    .modify((qb) => (year == null ? qb.whereNull('year') : qb.where('year', year)))
    .select('id', 'doi', 'first_author')
    .orderBy('id');
}

/** By DOI, in bulk: the reference (or the survivor of a merged one) of each DOI. */
export async function refIdsByDoi(db: Db, dois: string[]): Promise<Map<string, number>> {
  const out = new Map<string, number>();
  for (let i = 0; i < dois.length; i += 1000) {
    const rows: Pick<RefRow, 'id' | 'doi' | 'merged_into'>[] = await db<RefRow>('refs').whereIn('doi', dois.slice(i, i + 1000)).select('id', 'doi', 'merged_into');
    for (const r of rows) out.set(r.doi!, r.merged_into ?? r.id);
  }
  return out;
}

/** Live references with any of these title keys, in bulk, oldest first. */
export async function liveRefsWithTitleKeys(db: Db, keys: string[]): Promise<Pick<RefRow, 'id' | 'doi' | 'title_key' | 'year' | 'first_author'>[]> {
  const out: Pick<RefRow, 'id' | 'doi' | 'title_key' | 'year' | 'first_author'>[] = [];
  for (let i = 0; i < keys.length; i += 1000) {
    out.push(...(await db<RefRow>('refs').whereNull('merged_into').whereIn('title_key', keys.slice(i, i + 1000)).select('id', 'doi', 'title_key', 'year', 'first_author').orderBy('id')));
  }
  return out;
}

export interface NewRef {
  csl: Csl;
  cols: RefColumns;
  source: string;
  createdBy: number | null;
}

const refInsert = (r: NewRef) => ({ csl: JSON.stringify(r.csl), ...r.cols, source: r.source, created_by: r.createdBy });

export async function insertRef(db: Db, r: NewRef): Promise<number> {
  const [row] = await db('refs').insert(refInsert(r)).returning('id');
  return row.id;
}

/** Inserts many references in file order; returns their ids in the same order. */
export async function insertRefs(db: Db, rows: NewRef[]): Promise<number[]> {
  const ids: number[] = [];
  for (let i = 0; i < rows.length; i += 500) {
    const inserted: { id: number }[] = await db('refs').insert(rows.slice(i, i + 500).map(refInsert)).returning('id');
    ids.push(...inserted.map((r) => r.id));
  }
  return ids;
}

/** Inserts unless the DOI is taken; null when another row holds it. */
export async function insertRefUnlessDoiTaken(db: Db, r: NewRef): Promise<number | null> {
  const ins: { id: number }[] = await db('refs').insert(refInsert(r)).onConflict('doi').ignore().returning('id');
  return ins.length ? ins[0].id : null;
}

export async function updateRef(
  db: Db,
  id: number,
  patch: Partial<RefColumns> & { csl?: Csl; version?: number; screening_status?: ScreeningStatus; merged_into?: number },
): Promise<void> {
  const { csl, ...rest } = patch;
  await db('refs')
    .where({ id })
    .update({ ...rest, ...(csl ? { csl: JSON.stringify(csl) } : {}), updated_at: db.fn.now() });
}

export interface RefListFilters {
  q?: string;
  status?: ScreeningStatus;
  source?: string;
  yearFrom?: number;
  yearTo?: number;
  batch?: number;
}

export async function listRefs(db: Db, f: RefListFilters & PageRequest & { sort: string; order: 'asc' | 'desc' }) {
  const base = db<RefRow>('refs')
    .whereNull('merged_into')
    .modify((qb) => {
      if (f.q) {
        const like = `%${f.q.replace(/[\\%_]/g, '\\$&')}%`;
        qb.where((w) => w.whereILike('title', like).orWhereILike('first_author', like).orWhereILike('doi', like).orWhereILike('container', like));
      }
      if (f.status) qb.where('screening_status', f.status);
      if (f.source) qb.where('source', f.source);
      if (f.yearFrom !== undefined) qb.where('year', '>=', f.yearFrom);
      if (f.yearTo !== undefined) qb.where('year', '<=', f.yearTo);
      if (f.batch) qb.whereIn('id', db('import_entries').where({ batch_id: f.batch, status: 'imported' }).select('reference_id'));
    });
  const total = await countRows(base);
  const rows: RefSummaryRow[] = await pageOf(
    base
      .clone()
      .select(SUMMARY_COLUMNS)
      .orderByRaw(`${f.sort === 'title' ? 'lower(title)' : f.sort} ${f.order} NULLS LAST`)
      .orderBy('id', f.order),
    f,
  );
  return { total, rows };
}

/** The oldest live references with a screening status (optionally those one import batch created), and how many there are. */
export async function refsAwaiting(db: Db, q: { limit: number; batch?: number; status: ScreeningStatus; only?: (qb: Knex.QueryBuilder) => void }) {
  const base = db<RefRow>('refs')
    .whereNull('merged_into')
    .where('screening_status', q.status)
    .modify((qb) => {
      if (q.batch) qb.whereIn('id', db('import_entries').where({ batch_id: q.batch, status: 'imported' }).select('reference_id'));
      q.only?.(qb);
    });
  const total = await countRows(base);
  const rows: RefRow[] = await base.clone().orderBy([{ column: 'created_at' }, { column: 'id' }]).limit(q.limit).select('*');
  return { total, rows };
}

/** For the PRISMA flow: references by source, merged-away count, live ones by screening status. */
export async function refCounts(db: Db) {
  const bySource: { source: string; n: number }[] = await db('refs').groupBy('source').select('source').count({ n: '*' });
  const [{ merged }] = await db('refs').whereNotNull('merged_into').count<{ merged: number }[]>({ merged: '*' });
  const statuses: { screening_status: ScreeningStatus; n: number }[] = await db('refs').whereNull('merged_into').groupBy('screening_status').select('screening_status').count({ n: '*' });
  return { bySource: bySource.map((r) => ({ source: r.source, n: Number(r.n) })), merged: Number(merged), byStatus: statuses.map((s) => ({ status: s.screening_status, n: Number(s.n) })) };
}

export async function countLiveRefs(db: Db): Promise<number> {
  return countRows(db('refs').whereNull('merged_into'));
}

export const SEARCH_COLUMNS = ['id', 'csl', 'doi', 'title', 'year', 'container', 'screening_status', 'source', 'merged_into', 'created_at'] as const;
export type RefSearchRow = Pick<RefRow, (typeof SEARCH_COLUMNS)[number]>;

export async function refsForIndex(db: Db, ids: number[]): Promise<RefSearchRow[]> {
  return db<RefRow>('refs').whereIn('id', ids).select(SEARCH_COLUMNS);
}

/** Live references after `afterId`, in id order (for rebuilding the search index in chunks). */
export async function liveRefsAfter(db: Db, afterId: number, limit: number): Promise<RefSearchRow[]> {
  return db<RefRow>('refs').whereNull('merged_into').where('id', '>', afterId).orderBy('id').limit(limit).select(SEARCH_COLUMNS);
}

// ---- merging

/** Every single-column foreign key to refs.id in the database, found in the catalog (so later tables move too). */
export async function refForeignKeys(db: Db): Promise<Array<{ table: string; column: string }>> {
  const { rows } = await db.raw(`
    SELECT c.conrelid::regclass::text AS "table", a.attname AS "column"
    FROM pg_constraint c
    JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = c.conkey[1]
    WHERE c.contype = 'f' AND c.confrelid = 'refs'::regclass AND array_length(c.conkey, 1) = 1
    ORDER BY 1, 2`);
  return rows;
}

const quoteIdent = (s: string) => s.split('.').map((p) => `"${p.replace(/^"|"$/g, '').replace(/"/g, '""')}"`).join('.');

/** Points one foreign key column from one reference to another, in a savepoint; returns the rows moved. */
export async function repointForeignKey(trx: Knex.Transaction, fk: { table: string; column: string }, from: number, to: number): Promise<number> {
  return trx.transaction(async (sp) => {
    const res = await sp.raw(`UPDATE ${quoteIdent(fk.table)} SET ${quoteIdent(fk.column)} = ? WHERE ${quoteIdent(fk.column)} = ?`, [to, from]);
    return res.rowCount as number;
  });
}

export async function repointMergedInto(trx: Knex.Transaction, from: number, to: number): Promise<number> {
  return trx('refs').where({ merged_into: from }).update({ merged_into: to });
}

/** Marks a reference merged into another; its DOI moves off it (the column is unique). */
export async function markMerged(trx: Knex.Transaction, loser: Pick<RefRow, 'id' | 'version'>, survivorId: number): Promise<void> {
  await trx('refs').where({ id: loser.id }).update({ merged_into: survivorId, doi: null, version: loser.version + 1, updated_at: trx.fn.now() });
}

// ---- likely duplicates

/** Records a likely-duplicate pair for the curators' list (ordered so each pair is stored once). */
export async function insertDuplicateCandidate(db: Db, a: number, b: number, reason: string): Promise<void> {
  if (a === b) return;
  const [refA, refB] = a < b ? [a, b] : [b, a];
  await db('ref_duplicate_candidates').insert({ ref_a: refA, ref_b: refB, reason }).onConflict(['ref_a', 'ref_b']).ignore();
}

export async function findCandidate(db: Db, id: number): Promise<DuplicateCandidateRow | undefined> {
  return db<DuplicateCandidateRow>('ref_duplicate_candidates').where({ id }).first();
}

export async function lockCandidate(trx: Knex.Transaction, id: number): Promise<DuplicateCandidateRow | undefined> {
  return trx<DuplicateCandidateRow>('ref_duplicate_candidates').where({ id }).forUpdate().first();
}

export async function openCandidatesOf(db: Db, refId: number): Promise<DuplicateCandidateRow[]> {
  return db<DuplicateCandidateRow>('ref_duplicate_candidates')
    .where('status', 'open')
    .andWhere((w) => w.where('ref_a', refId).orWhere('ref_b', refId))
    .select('*');
}

export async function decideCandidate(db: Db, id: number, d: { status: 'merged' | 'dismissed'; decidedBy: number; keptRef?: number }): Promise<void> {
  await db('ref_duplicate_candidates')
    .where({ id })
    .update({ status: d.status, decided_by: d.decidedBy, decided_at: db.fn.now(), ...(d.keptRef ? { kept_ref: d.keptRef } : {}) });
}

export async function listCandidates(db: Db, q: PageRequest & { status: DuplicateCandidateRow['status']; sort: 'created_at' | 'year'; order: 'asc' | 'desc' }) {
  const base = db('ref_duplicate_candidates as d').where('d.status', q.status);
  const total = await countRows(base);
  const rows: (DuplicateCandidateRow & { decided_login: string | null })[] = await pageOf(
    base
      .clone()
      .join('refs as a', 'a.id', 'd.ref_a')
      .leftJoin('users as u', 'u.id', 'd.decided_by')
      .select('d.*', 'u.login as decided_login')
      .orderBy(q.sort === 'year' ? 'a.year' : 'd.created_at', q.order)
      .orderBy('d.id', q.order),
    q,
  );
  return { total, rows };
}

// ---- attachments

export async function insertAttachment(db: Db, a: Pick<AttachmentRow, 'ref_id' | 'filename' | 'stored_name' | 'size_bytes' | 'mime' | 'uploaded_by'>): Promise<Pick<AttachmentRow, 'id' | 'created_at'>> {
  const [row] = await db<AttachmentRow>('reference_attachments').insert(a).returning(['id', 'created_at']);
  return row;
}

export async function findAttachment(db: Db, refId: number, id: number): Promise<AttachmentRow | undefined> {
  return db<AttachmentRow>('reference_attachments').where({ id, ref_id: refId }).first();
}

export async function attachmentsOf(db: Db, refId: number): Promise<(AttachmentRow & { login: string | null })[]> {
  return db('reference_attachments')
    .leftJoin('users', 'users.id', 'reference_attachments.uploaded_by')
    .where('ref_id', refId)
    .orderBy('reference_attachments.id')
    .select('reference_attachments.*', 'users.login');
}

/** The attachments of several references (a queue page), oldest first. */
export async function attachmentsOfRefs(db: Db, refIds: number[]): Promise<AttachmentRow[]> {
  if (!refIds.length) return [];
  return db<AttachmentRow>('reference_attachments').whereIn('ref_id', refIds).orderBy('id').select('*');
}

/** What a bibliography needs of each reference, in id order. */
export async function refsForCitation(db: Db, ids: number[]): Promise<Pick<RefRow, 'id' | 'csl' | 'title' | 'year' | 'doi' | 'first_author' | 'merged_into'>[]> {
  return ids.length ? db<RefRow>('refs').whereIn('id', ids).orderBy('id').select('id', 'csl', 'title', 'year', 'doi', 'first_author', 'merged_into') : [];
}

// ---- searching without the index (while it is rebuilt or away)

export interface RefSearchFilter {
  words: string[];
  yearFrom?: number;
  yearTo?: number;
  status?: string;
  manipulation?: string;
  outcome?: string;
  task?: string;
}

const likeEscape = (s: string) => s.replace(/[\\%_]/g, '\\$&');

function liveRefsMatching(db: Db, f: RefSearchFilter) {
  return db<RefRow>('refs')
    .whereNull('merged_into')
    .modify((qb) => {
      for (const w of f.words) {
        qb.whereRaw(
          `concat_ws(' ', title, container, doi, jsonb_path_query_array(csl, '$.author[*].family')::text, jsonb_path_query_array(csl, '$.author[*].given')::text, csl->>'abstract') ILIKE ?`,
          [`%${likeEscape(w)}%`],
        );
      }
      if (f.yearFrom !== undefined) qb.where('year', '>=', f.yearFrom);
      if (f.yearTo !== undefined) qb.where('year', '<=', f.yearTo);
      if (f.status) qb.where('screening_status', f.status);
    })
    .modify(whereSettledCovers(db, f));
}

/** Live references whose text holds every word (in any field the index searches), one page, with facet counts. */
export async function searchLiveRefs(db: Db, f: RefSearchFilter, page: { limit: number; offset: number }) {
  const base = liveRefsMatching(db, f);
  const [rows, total, byStatus, byYear] = await Promise.all([
    base.clone().orderBy([{ column: 'year', order: 'desc', nulls: 'last' }, { column: 'id' }]).limit(page.limit).offset(page.offset).select(SEARCH_COLUMNS) as Promise<RefSearchRow[]>,
    countRows(base),
    base.clone().groupBy('screening_status').select('screening_status as key').count({ n: '*' }) as Promise<Array<{ key: string; n: string | number }>>,
    base.clone().whereNotNull('year').groupBy('year').select('year as key').count({ n: '*' }) as Promise<Array<{ key: number; n: string | number }>>,
  ]);
  const counts = (list: Array<{ key: string | number; n: string | number }>) => Object.fromEntries(list.map((r) => [String(r.key), Number(r.n)]));
  return { rows, total, facets: { screening_status: counts(byStatus), year: counts(byYear) } };
}
