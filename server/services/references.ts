import type { Knex } from 'knex';
import type { ReferenceEdit, ReferenceListQuery } from '../../shared/schemas/references.js';
import { toBibtex } from '../citations/index.js';
import { ConflictError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { recordAudit } from './audit.js';
import { authorKey, cleanCsl, cslAuthors, refColumns, richness, type Csl } from './reference-fields.js';

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

// ---- reading, editing, exporting and merging references


export interface ReferenceSummary {
  id: number;
  title: string;
  year: number | null;
  authors: string[];
  firstAuthor: string | null;
  container: string | null;
  doi: string | null;
  source: string;
  screeningStatus: string;
  createdAt: string;
}

const SUMMARY_COLUMNS = ['id', 'csl', 'title', 'year', 'first_author', 'container', 'doi', 'source', 'screening_status', 'merged_into', 'version', 'created_at', 'updated_at', 'created_by'];

export function summary(r: Record<string, any>): ReferenceSummary {
  return {
    id: r.id,
    title: r.title,
    year: r.year,
    authors: cslAuthors(r.csl ?? {}),
    firstAuthor: r.first_author,
    container: r.container,
    doi: r.doi,
    source: r.source,
    screeningStatus: r.screening_status,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

export async function listReferences(db: Knex, q: ReferenceListQuery) {
  const base = db('refs')
    .whereNull('merged_into')
    .modify((qb) => {
      if (q.q) {
        const like = `%${q.q.replace(/[\\%_]/g, '\\$&')}%`;
        qb.where((w) => w.whereILike('title', like).orWhereILike('first_author', like).orWhereILike('doi', like).orWhereILike('container', like));
      }
      if (q.status) qb.where('screening_status', q.status);
      if (q.source) qb.where('source', q.source);
      if (q.yearFrom !== undefined) qb.where('year', '>=', q.yearFrom);
      if (q.yearTo !== undefined) qb.where('year', '<=', q.yearTo);
      if (q.batch) qb.whereIn('id', db('import_entries').where({ batch_id: q.batch }).whereNotNull('reference_id').select('reference_id'));
    });
  const [{ count }] = await base.clone().count<{ count: number }[]>({ count: '*' });
  const rows = await base
    .clone()
    .select(SUMMARY_COLUMNS)
    .orderByRaw(`${q.sort === 'title' ? 'lower(title)' : q.sort} ${q.order} NULLS LAST`)
    .orderBy('id', q.order)
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  return { items: rows.map(summary), total: Number(count), page: q.page, pageSize: q.pageSize };
}

export async function getReference(db: Knex, id: number) {
  const r = await db('refs').leftJoin('users', 'users.id', 'refs.created_by').where('refs.id', id).first('refs.*', 'users.login as created_by_login');
  if (!r) throw new NotFoundError(`There is no reference ${id}.`);
  const [screening, attachments, duplicates, imports] = await Promise.all([
    db('screening_decisions')
      .leftJoin('users', 'users.id', 'screening_decisions.decided_by')
      .where('ref_id', id)
      .orderBy([{ column: 'decided_at', order: 'desc' }, { column: 'screening_decisions.id', order: 'desc' }])
      .select('screening_decisions.*', 'users.login'),
    db('reference_attachments').leftJoin('users', 'users.id', 'reference_attachments.uploaded_by').where('ref_id', id).orderBy('reference_attachments.id').select('reference_attachments.*', 'users.login'),
    db('ref_duplicate_candidates').where('status', 'open').andWhere((w) => w.where('ref_a', id).orWhere('ref_b', id)).select('*'),
    db('import_entries').join('import_batches', 'import_batches.id', 'import_entries.batch_id').where('reference_id', id).orderBy('import_batches.id').select('import_batches.id as batch_id', 'import_batches.format', 'import_entries.idx', 'import_entries.status', 'import_batches.created_at'),
  ]);
  return {
    reference: {
      ...summary(r),
      csl: r.csl,
      mergedInto: r.merged_into,
      version: r.version,
      updatedAt: new Date(r.updated_at).toISOString(),
      createdBy: r.created_by ? { id: r.created_by, login: r.created_by_login } : null,
      abstract: typeof r.csl?.abstract === 'string' ? r.csl.abstract : null,
    },
    screening: screening.map((s: Record<string, any>) => ({
      id: s.id,
      decision: s.decision,
      reason: s.reason,
      note: s.note,
      decidedAt: new Date(s.decided_at).toISOString(),
      decidedBy: s.decided_by ? { id: s.decided_by, login: s.login } : null,
      refId: s.ref_id,
    })),
    attachments: attachments.map((a: Record<string, any>) => ({
      id: a.id,
      filename: a.filename,
      sizeBytes: a.size_bytes,
      mime: a.mime,
      createdAt: new Date(a.created_at).toISOString(),
      uploadedBy: a.uploaded_by ? { id: a.uploaded_by, login: a.login } : null,
    })),
    duplicates: duplicates.map((d: Record<string, any>) => ({ candidateId: d.id, otherId: d.ref_a === id ? d.ref_b : d.ref_a, reason: d.reason })),
    imports: imports.map((i: Record<string, any>) => ({ batchId: i.batch_id, format: i.format, index: i.idx, status: i.status, at: new Date(i.created_at).toISOString() })),
  };
}

/** Edits the bibliographic fields (optimistic: the caller sends the version it saw). */
export async function editReference(db: Knex, id: number, edit: ReferenceEdit, actorId: number) {
  return db.transaction(async (trx) => {
    const r = await trx('refs').where({ id }).forUpdate().first();
    if (!r) throw new NotFoundError(`There is no reference ${id}.`);
    if (r.merged_into) throw new ConflictError(`Reference ${id} was merged into reference ${r.merged_into}; edit that one.`, { mergedInto: r.merged_into });
    if (r.version !== edit.version) throw new ConflictError(`Reference ${id} was changed by someone else (now version ${r.version}); reload it and edit again.`, { version: r.version });
    const csl = { ...r.csl };
    const changed: Record<string, { from: unknown; to: unknown }> = {};
    const set = (key: string, value: unknown) => {
      const from = csl[key];
      if (JSON.stringify(from ?? null) === JSON.stringify(value ?? null)) return;
      changed[key] = { from: from ?? null, to: value ?? null };
      if (value === null || value === undefined || value === '') delete csl[key];
      else csl[key] = value;
    };
    if (edit.title !== undefined) set('title', edit.title);
    if (edit.year !== undefined) set('issued', edit.year === null ? null : { 'date-parts': [[edit.year]] });
    if (edit.authors !== undefined) set('author', edit.authors.map((a) => (a.given ? { family: a.family, given: a.given } : { family: a.family })));
    if (edit.container !== undefined) set('container-title', edit.container);
    if (edit.doi !== undefined) set('DOI', edit.doi || null);
    if (edit.abstract !== undefined) set('abstract', edit.abstract);
    if (!Object.keys(changed).length) return { id, version: r.version, changed: [] as string[] };
    const cols = refColumns(csl);
    if (!cols.title) throw new UnprocessableError('A reference needs a title.', [{ path: 'body.title', message: 'a reference needs a title' }]);
    if (cols.doi && cols.doi !== r.doi) {
      const other = await trx('refs').where({ doi: cols.doi }).whereNot({ id }).first('id');
      if (other) throw new ConflictError(`DOI ${cols.doi} already belongs to reference ${other.id}.`, [{ path: 'body.doi', message: `already reference #${other.id}` }]);
    }
    await trx('refs').where({ id }).update({ csl: JSON.stringify(csl), ...cols, version: r.version + 1, updated_at: trx.fn.now() });
    const likely = await findDuplicate(trx, cols);
    if (likely.likely && likely.likely !== id) await offerDuplicate(trx, likely.likely, id, 'same title, year and first author');
    await recordAudit(trx, { actorId, action: 'reference.edit', entityType: 'reference', entityId: id, details: { changed, version: r.version + 1 } });
    return { id, version: r.version + 1, changed: Object.keys(changed) };
  });
}

export async function exportReferences(db: Knex, ids: number[], format: 'bibtex' | 'csl-json'): Promise<{ body: string; type: string; filename: string }> {
  const rows = await db('refs').whereIn('id', ids).select('id', 'csl', 'first_author', 'year', 'merged_into');
  const byId = new Map(rows.map((r: Record<string, any>) => [r.id, r]));
  const missing = ids.filter((i) => !byId.has(i));
  if (missing.length) throw new NotFoundError(`No reference with id ${missing.slice(0, 5).join(', ')}${missing.length > 5 ? '…' : ''}.`);
  const records = ids.map((i) => {
    const r = byId.get(i)!;
    const key = `${(r.first_author ?? 'anon').normalize('NFKD').replace(/[^A-Za-z]/g, '').toLowerCase() || 'anon'}${r.year ?? 'nd'}_${r.id}`;
    return { ...r.csl, id: `ref-${r.id}`, 'citation-key': key };
  });
  if (format === 'csl-json') return { body: JSON.stringify(records, null, 2), type: 'application/vnd.citationstyles.csl+json', filename: 'chronometa-references.json' };
  return { body: toBibtex(records), type: 'application/x-bibtex', filename: 'chronometa-references.bib' };
}

/** Every single-column foreign key to refs.id in the database, found in the catalog (so later tables move too). */
async function refForeignKeys(db: Knex | Knex.Transaction): Promise<Array<{ table: string; column: string }>> {
  const { rows } = await db.raw(`
    SELECT c.conrelid::regclass::text AS "table", a.attname AS "column"
    FROM pg_constraint c
    JOIN pg_attribute a ON a.attrelid = c.conrelid AND a.attnum = c.conkey[1]
    WHERE c.contype = 'f' AND c.confrelid = 'refs'::regclass AND array_length(c.conkey, 1) = 1
    ORDER BY 1, 2`);
  return rows;
}

const quoteIdent = (s: string) => s.split('.').map((p) => `"${p.replace(/^"|"$/g, '').replace(/"/g, '""')}"`).join('.');

/**
 * Merges two references: the survivor (the curator's choice or the richer record) keeps its record and gains
 * everything that pointed at the other (found through the catalog), the other points to it (merged_into) and
 * leaves lists and search. Written to the audit log.
 */
export async function mergeReferences(db: Knex, input: { a: number; b: number; keep?: number; candidateId?: number; actorId: number }) {
  if (input.a === input.b) throw new UnprocessableError('A reference cannot be merged with itself.');
  if (input.keep !== undefined && input.keep !== input.a && input.keep !== input.b) {
    throw new UnprocessableError(`keep must be one of the two references (${input.a} or ${input.b}).`, [{ path: 'body.keep', message: `choose ${input.a} or ${input.b}` }]);
  }
  return db.transaction(async (trx) => {
    const rows = await trx('refs').whereIn('id', [input.a, input.b]).forUpdate().select('*');
    if (rows.length !== 2) throw new NotFoundError(`Reference ${rows.some((r: { id: number }) => r.id === input.a) ? input.b : input.a} does not exist.`);
    for (const r of rows) if (r.merged_into) throw new ConflictError(`Reference ${r.id} was already merged into reference ${r.merged_into}.`);
    const [ra, rb] = [rows.find((r: { id: number }) => r.id === input.a), rows.find((r: { id: number }) => r.id === input.b)];
    let survivor = input.keep === undefined ? null : input.keep === ra.id ? ra : rb;
    if (!survivor) {
      const sa = richness(ra.csl);
      const sb = richness(rb.csl);
      survivor = sa > sb || (sa === sb && ra.id < rb.id) ? ra : rb;
    }
    const loser = survivor.id === ra.id ? rb : ra;

    const moved: Record<string, number> = {};
    for (const fk of await refForeignKeys(trx)) {
      if ((fk.table === 'refs' && fk.column === 'merged_into') || fk.table === 'ref_duplicate_candidates') continue;
      try {
        const n = await trx.transaction(async (sp) => {
          const res = await sp.raw(`UPDATE ${quoteIdent(fk.table)} SET ${quoteIdent(fk.column)} = ? WHERE ${quoteIdent(fk.column)} = ?`, [survivor.id, loser.id]);
          return res.rowCount as number;
        });
        if (n) moved[`${fk.table}.${fk.column}`] = n;
      } catch (err) {
        if ((err as { code?: string }).code === '23505') {
          throw new ConflictError(`Both references have rows in ${fk.table} that cannot both point at one reference; settle those first.`, { table: fk.table, column: fk.column });
        }
        throw err;
      }
    }
    const chained = await trx('refs').where({ merged_into: loser.id }).update({ merged_into: survivor.id });
    if (chained) moved['refs.merged_into'] = chained;

    // Likely-duplicate pairs: this one is settled; others that named the merged record now name the survivor.
    const pairs = await trx('ref_duplicate_candidates').where('status', 'open').andWhere((w) => w.where('ref_a', loser.id).orWhere('ref_b', loser.id));
    for (const p of pairs) {
      const other = p.ref_a === loser.id ? p.ref_b : p.ref_a;
      await trx('ref_duplicate_candidates').where({ id: p.id }).update({ status: 'merged', kept_ref: survivor.id, decided_by: input.actorId, decided_at: trx.fn.now() });
      if (other !== survivor.id) await offerDuplicate(trx, other, survivor.id, p.reason);
    }

    const survivorCsl = { ...survivor.csl };
    const survivorUpdate: Record<string, unknown> = { version: survivor.version + 1, updated_at: trx.fn.now() };
    await trx('refs').where({ id: loser.id }).update({ merged_into: survivor.id, doi: null, version: loser.version + 1, updated_at: trx.fn.now() });
    if (!survivor.doi && loser.doi) {
      survivorCsl.DOI = loser.doi;
      survivorUpdate.doi = loser.doi;
      survivorUpdate.csl = JSON.stringify(survivorCsl);
    }
    const latest = await trx('screening_decisions').where({ ref_id: survivor.id }).orderBy([{ column: 'decided_at', order: 'desc' }, { column: 'id', order: 'desc' }]).first('decision');
    survivorUpdate.screening_status = latest?.decision ?? 'unscreened';
    await trx('refs').where({ id: survivor.id }).update(survivorUpdate);
    await recordAudit(trx, {
      actorId: input.actorId,
      action: 'reference.merge',
      entityType: 'reference',
      entityId: survivor.id,
      details: { kept: survivor.id, merged: loser.id, candidate: input.candidateId ?? null, moved, mergedTitle: loser.title, mergedDoi: loser.doi },
    });
    return { kept: survivor.id, merged: loser.id, moved };
  });
}

export async function listDuplicateCandidates(db: Knex, q: { status: 'open' | 'merged' | 'dismissed'; page: number; pageSize: number; sort: 'created_at' | 'year'; order: 'asc' | 'desc' }) {
  const base = db('ref_duplicate_candidates as d').where('d.status', q.status);
  const [{ count }] = await base.clone().count<{ count: number }[]>({ count: '*' });
  const rows = await base
    .clone()
    .join('refs as a', 'a.id', 'd.ref_a')
    .leftJoin('users as u', 'u.id', 'd.decided_by')
    .select('d.*', 'u.login as decided_login')
    .orderBy(q.sort === 'year' ? 'a.year' : 'd.created_at', q.order)
    .orderBy('d.id', q.order)
    .limit(q.pageSize)
    .offset((q.page - 1) * q.pageSize);
  const ids = [...new Set(rows.flatMap((r: Record<string, any>) => [r.ref_a, r.ref_b]))];
  const refs = ids.length ? await db('refs').whereIn('id', ids).select(SUMMARY_COLUMNS) : [];
  const byId = new Map(refs.map((r: Record<string, any>) => [r.id, r]));
  const side = (id: number) => {
    const r = byId.get(id)!;
    return { ...summary(r), richness: Math.round(richness(r.csl) * 10) / 10, mergedInto: r.merged_into, fields: Object.keys(r.csl ?? {}).filter((k) => !k.startsWith('_')).length };
  };
  return {
    items: rows.map((r: Record<string, any>) => ({
      id: r.id,
      reason: r.reason,
      status: r.status,
      createdAt: new Date(r.created_at).toISOString(),
      decidedAt: r.decided_at ? new Date(r.decided_at).toISOString() : null,
      decidedBy: r.decided_by ? { id: r.decided_by, login: r.decided_login } : null,
      keptRef: r.kept_ref,
      a: side(r.ref_a),
      b: side(r.ref_b),
    })),
    total: Number(count),
    page: q.page,
    pageSize: q.pageSize,
  };
}

export async function mergeCandidate(db: Knex, candidateId: number, keep: number | undefined, actorId: number) {
  const c = await db('ref_duplicate_candidates').where({ id: candidateId }).first();
  if (!c) throw new NotFoundError(`There is no duplicate candidate ${candidateId}.`);
  if (c.status !== 'open') throw new ConflictError(`Candidate ${candidateId} is already ${c.status}.`);
  const result = await mergeReferences(db, { a: c.ref_a, b: c.ref_b, keep, candidateId, actorId });
  return result;
}

export async function dismissCandidate(db: Knex, candidateId: number, actorId: number) {
  return db.transaction(async (trx) => {
    const c = await trx('ref_duplicate_candidates').where({ id: candidateId }).forUpdate().first();
    if (!c) throw new NotFoundError(`There is no duplicate candidate ${candidateId}.`);
    if (c.status !== 'open') throw new ConflictError(`Candidate ${candidateId} is already ${c.status}.`);
    await trx('ref_duplicate_candidates').where({ id: candidateId }).update({ status: 'dismissed', decided_by: actorId, decided_at: trx.fn.now() });
    await recordAudit(trx, { actorId, action: 'reference.duplicate_dismissed', entityType: 'reference', entityId: c.ref_a, details: { candidate: candidateId, refs: [c.ref_a, c.ref_b] } });
    return { id: candidateId, status: 'dismissed' as const };
  });
}

