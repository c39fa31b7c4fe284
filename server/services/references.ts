import type { Knex } from 'knex';
import { pageOf } from '../../shared/schemas/common.js';
import type {
  DismissResult, DuplicatePage, MergeResult, ReferenceDetail, ReferenceEdit, ReferenceEditResult, ReferenceListQuery, ReferencePage, ReferenceSummary,
} from '../../shared/schemas/references.js';
import { toBibtex } from '../adapters/citations.js';
import { ConflictError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import { bumpRegistry } from '../repositories/registry-version.js';
import { iso, isoOrNull, type Db } from '../repositories/db.js';
import { importsOfRef } from '../repositories/imports.js';
import {
  attachmentsOf, decideCandidate, findCandidate, findRefByDoi, findRefWithCreator, insertDuplicateCandidate, insertRef, listCandidates, listRefs,
  liveRefsWithTitle, lockCandidate, lockRef, lockRefs, markMerged, openCandidatesOf, otherRefWithDoi, refForeignKeys, refsByIds, repointForeignKey,
  repointMergedInto, updateRef, type RefColumns, type RefSummaryRow,
} from '../repositories/refs.js';
import { decisionsOf, latestDecision } from '../repositories/screening.js';
import { statusAfter } from '../../shared/vocabulary/screening.js';
import { settledEffectCountOf } from '../repositories/settled-effects.js';
import { authorKey, cleanCsl, cslAuthors, refColumns, richness, type Csl } from './reference-fields.js';

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
export async function findDuplicate(db: Db, cols: RefColumns): Promise<{ exact?: number; likely?: number }> {
  if (cols.doi) {
    const byDoi = await findRefByDoi(db, cols.doi);
    if (byDoi) return { exact: byDoi.merged_into ?? byDoi.id };
  }
  if (!cols.title_key) return {};
  const ak = authorKey(cols.first_author);
  const matches = (await liveRefsWithTitle(db, cols.title_key, cols.year)).filter((r) => authorKey(r.first_author) === ak);
  if (!matches.length) return {};
  if (!cols.doi) {
    const noDoi = matches.find((r) => !r.doi);
    if (noDoi) return { exact: noDoi.id };
  }
  return { likely: matches[0].id };
}

/** Records a likely-duplicate pair for the curators' list. */
export const offerDuplicate = insertDuplicateCandidate;

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
  const id = await insertRef(db, { csl: clean, cols, source: opts.source, createdBy: opts.createdBy ?? null });
  if (dup.likely) await offerDuplicate(db, dup.likely, id, 'same title, year and first author');
  return { id, created: true, ...(dup.likely ? { likelyDuplicateOf: dup.likely } : {}) };
}

// ---- reading, editing, exporting and merging references

export function summary(r: RefSummaryRow): ReferenceSummary {
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
    createdAt: iso(r.created_at),
  };
}

export async function listReferences(db: Knex, q: ReferenceListQuery): Promise<ReferencePage> {
  const { total, rows } = await listRefs(db, q);
  return pageOf(rows.map(summary), total, q);
}

const who = (id: number | null, login: string | null) => (id ? { id, login: login ?? '' } : null);

export async function getReference(db: Knex, id: number): Promise<ReferenceDetail> {
  const r = await findRefWithCreator(db, id);
  if (!r) throw new NotFoundError(`There is no reference ${id}.`);
  const [screening, attachments, duplicates, imports, settledEffects] = await Promise.all([
    decisionsOf(db, id), attachmentsOf(db, id), openCandidatesOf(db, id), importsOfRef(db, id), settledEffectCountOf(db, id),
  ]);
  return {
    reference: {
      ...summary(r),
      csl: r.csl,
      mergedInto: r.merged_into,
      version: r.version,
      updatedAt: iso(r.updated_at),
      createdBy: who(r.created_by, r.created_by_login),
      abstract: typeof r.csl?.abstract === 'string' ? r.csl.abstract : null,
      settledEffects,
    },
    screening: screening.map((s) => ({
      id: s.id,
      stage: s.stage,
      decision: s.decision,
      reason: s.reason,
      note: s.note,
      decidedAt: iso(s.decided_at),
      decidedBy: who(s.decided_by, s.login),
      refId: s.ref_id,
    })),
    attachments: attachments.map((a) => ({
      id: a.id,
      filename: a.filename,
      sizeBytes: a.size_bytes,
      mime: a.mime,
      createdAt: iso(a.created_at),
      uploadedBy: who(a.uploaded_by, a.login),
    })),
    duplicates: duplicates.map((d) => ({ candidateId: d.id, otherId: d.ref_a === id ? d.ref_b : d.ref_a, reason: d.reason })),
    imports: imports.map((i) => ({ batchId: i.batch_id, format: i.format, index: i.idx, status: i.status, at: iso(i.created_at) })),
  };
}

/** Edits the bibliographic fields (optimistic: the caller sends the version it saw). */
export async function editReference(db: Knex, id: number, edit: ReferenceEdit, actorId: number): Promise<ReferenceEditResult> {
  return db.transaction(async (trx) => {
    const r = await lockRef(trx, id);
    if (!r) throw new NotFoundError(`There is no reference ${id}.`);
    if (r.merged_into) throw new ConflictError(`Reference ${id} was merged into reference ${r.merged_into}; edit that one.`, { mergedInto: r.merged_into });
    if (r.version !== edit.version) throw new ConflictError(`Reference ${id} was changed by someone else (now version ${r.version}); reload it and edit again.`, { version: r.version });
    const csl: Csl = { ...r.csl };
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
      const other = await otherRefWithDoi(trx, cols.doi, id);
      if (other) throw new ConflictError(`DOI ${cols.doi} already belongs to reference ${other.id}.`, [{ path: 'body.doi', message: `already reference #${other.id}` }]);
    }
    await updateRef(trx, id, { csl, ...cols, version: r.version + 1 });
    const likely = await findDuplicate(trx, cols);
    if (likely.likely && likely.likely !== id) await offerDuplicate(trx, likely.likely, id, 'same title, year and first author');
    await recordAudit(trx, { actorId, action: 'reference.edit', entityType: 'reference', entityId: id, details: { changed, version: r.version + 1 } });
    // Year, authors and title are filters and labels of settled effects.
    await bumpRegistry(trx, { kind: 'reference.edit', referenceId: id, actorId, details: { changed: Object.keys(changed) } });
    return { id, version: r.version + 1, changed: Object.keys(changed) };
  });
}

export async function exportReferences(db: Knex, ids: number[], format: 'bibtex' | 'csl-json'): Promise<{ body: string; type: string; filename: string }> {
  const rows = await refsByIds(db, ids);
  const byId = new Map(rows.map((r) => [r.id, r]));
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

/**
 * Merges two references: the survivor (the curator's choice or the richer record) keeps its record and gains
 * everything that pointed at the other (found through the catalog), the other points to it (merged_into) and
 * leaves lists and search. Written to the audit log.
 */
export async function mergeReferences(db: Knex, input: { a: number; b: number; keep?: number; candidateId?: number; actorId: number }): Promise<MergeResult> {
  if (input.a === input.b) throw new UnprocessableError('A reference cannot be merged with itself.');
  if (input.keep !== undefined && input.keep !== input.a && input.keep !== input.b) {
    throw new UnprocessableError(`keep must be one of the two references (${input.a} or ${input.b}).`, [{ path: 'body.keep', message: `choose ${input.a} or ${input.b}` }]);
  }
  return db.transaction(async (trx) => {
    const rows = await lockRefs(trx, [input.a, input.b]);
    if (rows.length !== 2) throw new NotFoundError(`Reference ${rows.some((r) => r.id === input.a) ? input.b : input.a} does not exist.`);
    for (const r of rows) if (r.merged_into) throw new ConflictError(`Reference ${r.id} was already merged into reference ${r.merged_into}.`);
    const ra = rows.find((r) => r.id === input.a)!;
    const rb = rows.find((r) => r.id === input.b)!;
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
        const n = await repointForeignKey(trx, fk, loser.id, survivor.id);
        if (n) moved[`${fk.table}.${fk.column}`] = n;
      } catch (err) {
        if ((err as { code?: string }).code === '23505') {
          throw new ConflictError(`Both references have rows in ${fk.table} that cannot both point at one reference; settle those first.`, { table: fk.table, column: fk.column });
        }
        throw err;
      }
    }
    const chained = await repointMergedInto(trx, loser.id, survivor.id);
    if (chained) moved['refs.merged_into'] = chained;

    // Likely-duplicate pairs: this one is settled; others that named the merged record now name the survivor.
    for (const p of await openCandidatesOf(trx, loser.id)) {
      const other = p.ref_a === loser.id ? p.ref_b : p.ref_a;
      await decideCandidate(trx, p.id, { status: 'merged', keptRef: survivor.id, decidedBy: input.actorId });
      if (other !== survivor.id) await offerDuplicate(trx, other, survivor.id, p.reason);
    }

    await markMerged(trx, loser, survivor.id);
    const latest = await latestDecision(trx, survivor.id);
    const takesDoi = !survivor.doi ? loser.doi : null;
    await updateRef(trx, survivor.id, {
      version: survivor.version + 1,
      screening_status: latest ? statusAfter(latest.stage, latest.decision) : 'unscreened',
      ...(takesDoi ? { doi: takesDoi, csl: { ...survivor.csl, DOI: takesDoi } } : {}),
    });
    await recordAudit(trx, {
      actorId: input.actorId,
      action: 'reference.merge',
      entityType: 'reference',
      entityId: survivor.id,
      details: { kept: survivor.id, merged: loser.id, candidate: input.candidateId ?? null, moved, mergedTitle: loser.title, mergedDoi: loser.doi },
    });
    await bumpRegistry(trx, { kind: 'reference.merge', referenceId: survivor.id, actorId: input.actorId, details: { merged: loser.id } });
    return { kept: survivor.id, merged: loser.id, moved };
  });
}

export async function listDuplicateCandidates(db: Knex, q: { status: 'open' | 'merged' | 'dismissed'; page: number; pageSize: number; sort: 'created_at' | 'year'; order: 'asc' | 'desc' }): Promise<DuplicatePage> {
  const { total, rows } = await listCandidates(db, q);
  const refs = await refsByIds(db, [...new Set(rows.flatMap((r) => [r.ref_a, r.ref_b]))]);
  const byId = new Map(refs.map((r) => [r.id, r]));
  const side = (id: number) => {
    const r = byId.get(id)!;
    return { ...summary(r), richness: Math.round(richness(r.csl) * 10) / 10, mergedInto: r.merged_into, fields: Object.keys(r.csl ?? {}).filter((k) => !k.startsWith('_')).length };
  };
  return pageOf(
    rows.map((r) => ({
      id: r.id,
      reason: r.reason,
      status: r.status,
      createdAt: iso(r.created_at),
      decidedAt: isoOrNull(r.decided_at),
      decidedBy: who(r.decided_by, r.decided_login),
      keptRef: r.kept_ref,
      a: side(r.ref_a),
      b: side(r.ref_b),
    })),
    total,
    q,
  );
}

export async function mergeCandidate(db: Knex, candidateId: number, keep: number | undefined, actorId: number): Promise<MergeResult> {
  const c = await findCandidate(db, candidateId);
  if (!c) throw new NotFoundError(`There is no duplicate candidate ${candidateId}.`);
  if (c.status !== 'open') throw new ConflictError(`Candidate ${candidateId} is already ${c.status}.`);
  return mergeReferences(db, { a: c.ref_a, b: c.ref_b, keep, candidateId, actorId });
}

export async function dismissCandidate(db: Knex, candidateId: number, actorId: number): Promise<DismissResult> {
  return db.transaction(async (trx) => {
    const c = await lockCandidate(trx, candidateId);
    if (!c) throw new NotFoundError(`There is no duplicate candidate ${candidateId}.`);
    if (c.status !== 'open') throw new ConflictError(`Candidate ${candidateId} is already ${c.status}.`);
    await decideCandidate(trx, candidateId, { status: 'dismissed', decidedBy: actorId });
    await recordAudit(trx, { actorId, action: 'reference.duplicate_dismissed', entityType: 'reference', entityId: c.ref_a, details: { candidate: candidateId, refs: [c.ref_a, c.ref_b] } });
    return { id: candidateId, status: 'dismissed' as const };
  });
}
