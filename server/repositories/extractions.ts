import type { Knex } from 'knex';
import type { Sheet } from '../../shared/schemas/extraction.js';
import { tryComputeReported, type Reported } from '../../shared/extraction/compute.js';
import { orientAttempt } from '../../shared/extraction/orientation.js';
import type { StoredStudy } from '../../shared/extraction/stored-sheet.js';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import { effectColumns, storedEffect } from './effect-columns.js';
import type { EffectRow, ExtractionRow, ExtractionState, ExtractionStudyRow, RefRow, SettlementKind, SettlementRow } from './rows.js';

export type { StoredStudy };

// ---- extraction rows (a coder's sheet, or a version of a reference's settled record)

export async function findExtraction(db: Db, id: number): Promise<ExtractionRow | undefined> {
  return db<ExtractionRow>('extractions').where({ id }).first();
}

export async function lockExtraction(trx: Knex.Transaction, id: number): Promise<ExtractionRow | undefined> {
  return trx<ExtractionRow>('extractions').where({ id }).forUpdate().first();
}

export type NewExtraction = Pick<ExtractionRow, 'reference_id' | 'kind' | 'state'> &
  Partial<Pick<ExtractionRow, 'assignment_id' | 'coder_id' | 'record_version' | 'supersedes_id' | 'reopen_reason' | 'notes' | 'updated_by'>> & { settledNow?: boolean };

export async function insertExtraction(trx: Knex.Transaction, x: NewExtraction): Promise<ExtractionRow> {
  const { settledNow, ...row } = x;
  const [created] = await trx('extractions')
    .insert({ ...row, ...(settledNow ? { settled_at: trx.fn.now(), submitted_at: trx.fn.now() } : {}) })
    .returning('*');
  return created;
}

export async function insertCodingSheets(trx: Knex.Transaction, rows: Array<{ referenceId: number; assignmentId: number | null; coderId: number; actorId: number }>): Promise<{ id: number; coder_id: number }[]> {
  if (!rows.length) return [];
  return trx('extractions')
    .insert(rows.map((r) => ({ reference_id: r.referenceId, assignment_id: r.assignmentId, kind: 'coding', coder_id: r.coderId, state: 'draft', updated_by: r.actorId })))
    .returning(['id', 'coder_id']);
}

type Stamp = 'submitted' | 'settled';

/** Updates one extraction; `stamp` sets submitted_at or settled_at to now. Returns its new version and time. */
export async function updateExtraction(
  trx: Knex.Transaction,
  id: number,
  patch: Partial<Pick<ExtractionRow, 'state' | 'version' | 'notes' | 'updated_by' | 'superseded_by' | 'assignment_id'>>,
  stamp?: Stamp,
): Promise<Pick<ExtractionRow, 'version' | 'updated_at'>> {
  const [row] = await trx('extractions')
    .where({ id })
    .update({ ...patch, ...(stamp ? { [`${stamp}_at`]: trx.fn.now() } : {}), updated_at: trx.fn.now() })
    .returning(['version', 'updated_at']);
  return row;
}

/** Moves both coding sheets of a pair to a state (the pair's verdict). */
export async function setPairSheetsState(trx: Knex.Transaction, assignmentId: number, state: ExtractionState): Promise<void> {
  await trx('extractions')
    .where({ assignment_id: assignmentId, kind: 'coding' })
    .update({ state, ...(state === 'settled' ? { settled_at: trx.fn.now() } : {}), updated_at: trx.fn.now() });
}

/** The coding sheets of a pair (optionally only those past draft). */
export async function pairSheets(db: Db, assignmentId: number, opts: { submittedOnly?: boolean } = {}): Promise<ExtractionRow[]> {
  return db<ExtractionRow>('extractions')
    .where({ assignment_id: assignmentId, kind: 'coding' })
    .modify((q) => (opts.submittedOnly ? q.whereNot('state', 'draft') : q));
}

/** A contributor's own unsettled sheet for a reference. */
export async function openSheetOf(db: Db, referenceId: number, coderId: number): Promise<Pick<ExtractionRow, 'id'> | undefined> {
  return db<ExtractionRow>('extractions').where({ reference_id: referenceId, kind: 'coding', coder_id: coderId }).whereNot('state', 'settled').first('id');
}

export interface ClaimRow {
  id: number;
  coder_id: number;
  state: 'draft' | 'submitted';
  login: string;
}

/** Claims of a reference: coding sheets, drafts or submitted, that belong to no pair yet. */
export async function unpairedClaims(db: Db, referenceId: number): Promise<ClaimRow[]> {
  return db('extractions as x')
    .join('users as u', 'u.id', 'x.coder_id')
    .where({ 'x.reference_id': referenceId, 'x.kind': 'coding' })
    .whereIn('x.state', ['draft', 'submitted'])
    .whereNull('x.assignment_id')
    .orderBy('x.id')
    .select('x.id', 'x.coder_id', 'x.state', 'u.login');
}

/** The claims subquery as JSON per reference (alias r), for lists that show who claimed what. */
export function claimsJson(db: Db) {
  return db.raw(`(select coalesce(json_agg(json_build_object('extractionId', x.id, 'coderId', x.coder_id, 'coder', u.login, 'state', x.state) order by x.id), '[]'::json)
    from extractions x join users u on u.id = x.coder_id
    where x.reference_id = r.id and x.kind = 'coding' and x.assignment_id is null and x.state in ('draft', 'submitted')) as claims`);
}

export async function joinPair(trx: Knex.Transaction, extractionIds: number[], assignmentId: number): Promise<void> {
  if (extractionIds.length) await trx('extractions').whereIn('id', extractionIds).update({ assignment_id: assignmentId, updated_at: trx.fn.now() });
}

export type ExtractionDetailRow = ExtractionRow & Pick<RefRow, 'title' | 'first_author' | 'year' | 'doi'> & { coder_login: string | null; updated_by_login: string | null };

export async function findExtractionDetail(db: Db, id: number): Promise<ExtractionDetailRow | undefined> {
  return db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .leftJoin('users as c', 'c.id', 'x.coder_id')
    .leftJoin('users as u', 'u.id', 'x.updated_by')
    .where('x.id', id)
    .first('x.*', 'r.title', 'r.first_author', 'r.year', 'r.doi', 'c.login as coder_login', 'u.login as updated_by_login');
}

export async function listSheetsOf(db: Db, coderId: number, q: PageRequest & { state?: string; sort: 'updated' | 'reference' | 'state'; order: 'asc' | 'desc' }) {
  const base = db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .where({ 'x.coder_id': coderId, 'x.kind': 'coding' })
    .modify((qb) => {
      if (q.state) qb.where('x.state', q.state);
    });
  const total = await countRows(base);
  const sort = { updated: 'x.updated_at', reference: 'r.first_author', state: 'x.state' }[q.sort];
  const rows: Array<Pick<ExtractionRow, 'id' | 'state' | 'version' | 'updated_at' | 'assignment_id' | 'reference_id'> & Pick<RefRow, 'title' | 'first_author' | 'year'> & { effects: number }> = await pageOf(
    base
      .clone()
      .select('x.id', 'x.state', 'x.version', 'x.updated_at', 'x.assignment_id', 'x.reference_id', 'r.title', 'r.first_author', 'r.year')
      .select(db.raw(`(select count(*)::int from effects f where f.extraction_id = x.id) as effects`))
      .orderBy(sort, q.order)
      .orderBy('x.id', 'asc'),
    q,
  );
  return { total, rows };
}

/** Included references a contributor may claim: not being double coded, not settled, not already theirs. */
export async function listClaimable(db: Db, coderId: number, q: PageRequest & { q?: string; sort: 'reference' | 'year'; order: 'asc' | 'desc' }) {
  const base = db('refs as r')
    .whereNull('r.merged_into')
    .where('r.screening_status', 'included')
    .whereNotExists(db('assignments as a').whereRaw('a.reference_id = r.id').whereIn('a.state', ['coding', 'disputed']))
    .whereNotExists(db('extractions as x').whereRaw('x.reference_id = r.id').where('x.kind', 'settled').whereNull('x.superseded_by').whereIn('x.state', ['settled', 'draft']))
    .whereNotExists(db('extractions as m').whereRaw('m.reference_id = r.id').where({ 'm.kind': 'coding', 'm.coder_id': coderId }).whereNot('m.state', 'settled'))
    // someone else's claim: a curator pairs a second coder with them instead
    .whereNotExists(db('extractions as c').whereRaw('c.reference_id = r.id').where('c.kind', 'coding').whereNull('c.assignment_id').whereIn('c.state', ['draft', 'submitted']))
    .modify((qb) => {
      if (q.q) qb.where((w) => w.whereILike('r.title', `%${q.q}%`).orWhereILike('r.first_author', `%${q.q}%`));
    });
  const total = await countRows(base);
  const rows: Pick<RefRow, 'id' | 'title' | 'first_author' | 'year' | 'doi'>[] = await pageOf(
    base.clone().select('r.id', 'r.title', 'r.first_author', 'r.year', 'r.doi').orderBy(q.sort === 'year' ? 'r.year' : 'r.first_author', q.order).orderBy('r.id', 'asc'),
    q,
  );
  return { total, rows };
}

// ---- settled records and their history

/** The current settled record of a reference (not superseded), or undefined. */
export async function currentRecord(db: Db, referenceId: number): Promise<ExtractionRow | undefined> {
  return db<ExtractionRow>('extractions').where({ reference_id: referenceId, kind: 'settled' }).whereNull('superseded_by').orderBy('record_version', 'desc').first();
}

export async function recordsOf(db: Db, referenceId: number): Promise<Array<Pick<ExtractionRow, 'id' | 'state' | 'record_version' | 'superseded_by' | 'reopen_reason' | 'settled_at' | 'created_at'> & { updated_by: string | null }>> {
  return db('extractions as x')
    .leftJoin('users as u', 'u.id', 'x.updated_by')
    .where({ 'x.reference_id': referenceId, 'x.kind': 'settled' })
    .orderBy('x.record_version', 'desc')
    .select('x.id', 'x.state', 'x.record_version', 'x.superseded_by', 'x.reopen_reason', 'x.settled_at', 'x.created_at', 'u.login as updated_by');
}

/** Reopened records waiting to be settled again (newest first). */
export async function reopenedRecords(db: Db, limit: number): Promise<Array<Pick<ExtractionRow, 'id' | 'reference_id' | 'record_version' | 'reopen_reason' | 'updated_at'> & Pick<RefRow, 'title' | 'first_author' | 'year'>>> {
  return db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .where({ 'x.kind': 'settled', 'x.state': 'draft' })
    .orderBy('x.updated_at', 'desc')
    .limit(limit)
    .select('x.id', 'x.reference_id', 'x.record_version', 'x.reopen_reason', 'x.updated_at', 'r.title', 'r.first_author', 'r.year');
}

export async function insertSettlement(trx: Knex.Transaction, s: { referenceId: number; assignmentId: number | null; recordId: number; kind: SettlementKind; actorId: number | null; rationale: string }): Promise<void> {
  await trx('settlements').insert({ reference_id: s.referenceId, assignment_id: s.assignmentId, record_id: s.recordId, kind: s.kind, actor_id: s.actorId, rationale: s.rationale });
}

export async function settlementsOf(db: Db, referenceId: number): Promise<(SettlementRow & { login: string | null })[]> {
  return db('settlements as s').leftJoin('users as u', 'u.id', 's.actor_id').where('s.reference_id', referenceId).orderBy('s.id', 'desc').select('s.*', 'u.login');
}

export async function latestSettlementOfPair(db: Db, assignmentId: number): Promise<SettlementRow | undefined> {
  return db<SettlementRow>('settlements').where({ assignment_id: assignmentId }).orderBy('id', 'desc').first();
}

// ---- studies and sheets

/** The stable study ids of an extraction's studies, by position. */
export async function studyIdsOf(db: Db, extractionId: number): Promise<(number | null)[]> {
  return db<ExtractionStudyRow>('extraction_studies').where({ extraction_id: extractionId }).orderBy('position').pluck('study_id');
}

/** A new stable study identity for a reference. */
export async function newStudy(trx: Knex.Transaction, referenceId: number): Promise<number> {
  const [row] = await trx('studies').insert({ reference_id: referenceId }).returning('id');
  return row.id;
}

/**
 * Replaces the studies and effects of one extraction with the sheet's, computing every effect that can be
 * computed (the server never trusts numbers sent by a client). `termIds` maps each manipulation term to its id
 * (resolve them first); `studyIds` gives the stable study identity of each study by position (settled records).
 */
export async function writeSheet(trx: Knex.Transaction, extractionId: number, sheet: Sheet, opts: { termIds: Map<string, number>; studyIds?: (number | null)[]; actorId?: number | null }) {
  await trx('extraction_studies').where({ extraction_id: extractionId }).delete();
  for (const [i, s] of sheet.studies.entries()) {
    const [study] = await trx('extraction_studies')
      .insert({
        extraction_id: extractionId,
        study_id: opts.studyIds?.[i] ?? null,
        position: i + 1,
        label: s.label ?? '',
        design: s.design ?? null,
        n1: s.n1 ?? null,
        n2: s.n2 ?? null,
        population: s.population ?? null,
        diagnosis: s.diagnosis ?? null,
        modality: s.modality ?? null,
        task: s.task ?? null,
        standard_ms: s.standardMs ?? null,
      })
      .returning('id');
    if (!s.effects.length) continue;
    await trx('effects').insert(
      s.effects.map((e, j) => {
        const c = e.form ? orientAttempt(tryComputeReported(e.form, e.reported as Reported, e.assumedR ?? null), e, s.task) : null;
        const manipulationId = e.manipulation ? (opts.termIds.get(e.manipulation) ?? null) : null;
        return { extraction_id: extractionId, extraction_study_id: study.id, position: j + 1, updated_by: opts.actorId ?? null, ...effectColumns(e, manipulationId, c?.ok ? c.result! : null) };
      }),
    );
  }
}

const u = <T>(v: T | null | undefined): T | undefined => (v === null ? undefined : v);

/** The stored studies and effects of an extraction, in sheet order. */
export async function readSheet(db: Db, extractionId: number): Promise<StoredStudy[]> {
  const studies: ExtractionStudyRow[] = await db<ExtractionStudyRow>('extraction_studies').where({ extraction_id: extractionId }).orderBy('position');
  const effects: (EffectRow & { term: string | null })[] = await db('effects as f')
    .leftJoin('manipulations as m', 'm.id', 'f.manipulation_id')
    .where('f.extraction_id', extractionId)
    .orderBy(['f.extraction_study_id', 'f.position'])
    .select('f.*', 'm.term');
  return studies.map((s) => ({
    id: s.id,
    studyId: s.study_id,
    label: s.label,
    design: u(s.design),
    n1: u(s.n1),
    n2: u(s.n2),
    population: u(s.population),
    diagnosis: u(s.diagnosis),
    modality: u(s.modality),
    task: u(s.task),
    standardMs: s.standard_ms == null ? undefined : Number(s.standard_ms),
    effects: effects.filter((f) => f.extraction_study_id === s.id).map(storedEffect),
  }));
}

/** The manipulation terms a sheet names (to resolve before writing it). */
export const sheetTerms = (sheet: Sheet): string[] => sheet.studies.flatMap((s) => s.effects.map((e) => e.manipulation).filter((t): t is string => !!t));

/** Live included references with a coding sheet past draft (submitted, compared or settled): coded, for the flow counts. */
export async function codedReferenceCount(db: Db): Promise<number> {
  const [row] = await db('extractions as x')
    .join('refs as r', 'r.id', 'x.reference_id')
    .whereNull('r.merged_into')
    .where('r.screening_status', 'included')
    .whereNot('x.state', 'draft')
    .countDistinct<{ n: string }[]>({ n: 'x.reference_id' });
  return Number(row.n);
}
