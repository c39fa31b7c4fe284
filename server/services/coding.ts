// A coder's own sheets: claiming a reference, reading (blind to the other coder), saving drafts, submitting.
import type { Knex } from 'knex';
import { hasRole, type Role } from '../../shared/roles.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { ClaimablePage, Created, ExtractionDetail, MyExtractionPage, SavedSheet, Sheet, SubmitResult } from '../../shared/schemas/extraction.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import type { MailingDeps } from './deps.js';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError } from '../lib/errors.js';
import { activeAssignmentOf, findAssignment, lockAssignment } from '../repositories/assignments.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull, refLabel, type Db, type PageRequest } from '../repositories/db.js';
import {
  findExtraction, findExtractionDetail, insertCodingSheets, listClaimable as claimableRows, listSheetsOf, lockExtraction, openSheetOf, pairSheets, readSheet,
  studyIdsOf, updateExtraction, type ExtractionDetailRow,
} from '../repositories/extractions.js';
import { lockRef } from '../repositories/refs.js';
import type { ExtractionRow, ExtractionState } from '../repositories/rows.js';
import { comparePair } from './assignments.js';
import { staleEdit } from './edit-conflicts.js';
import { queueMails, type OutgoingMail } from './mail.js';
import { parseCompleteSheet, saveSheet, stableStudyIds } from './settlement.js';
import { refreshDerivations } from './trials.js';

export interface Actor {
  id: number;
  roles: Role[];
}

export async function listMyExtractions(db: Knex, userId: number, q: PageRequest & { state?: ExtractionState; sort: 'updated' | 'reference' | 'state'; order: 'asc' | 'desc' }): Promise<MyExtractionPage> {
  const { total, rows } = await listSheetsOf(db, userId, q);
  const items = rows.map((r) => ({
    id: r.id, state: r.state, version: r.version, updatedAt: iso(r.updated_at), assignmentId: r.assignment_id,
    referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, effects: r.effects,
  }));
  return pageOf(items, total, q);
}

/** Included references a contributor may claim: not being double coded, not settled, not already claimed by them. */
export async function listClaimable(db: Knex, userId: number, q: PageRequest & { q?: string; sort: 'reference' | 'year'; order: 'asc' | 'desc' }): Promise<ClaimablePage> {
  const { total, rows } = await claimableRows(db, userId, q);
  return pageOf(rows.map((r) => ({ id: r.id, title: r.title, referenceLabel: refLabel(r), year: r.year, doi: r.doi })), total, q);
}

/** A contributor claims a reference to code it; a curator later pairs the claim with a second coder. */
export async function claimReference(db: Knex, actorId: number, referenceId: number): Promise<Created> {
  return db.transaction(async (trx) => {
    const ref = await lockRef(trx, referenceId);
    if (!ref) throw new NotFoundError(`No reference ${referenceId}.`);
    if (ref.merged_into) throw new UnprocessableError(`Reference ${referenceId} was merged into ${ref.merged_into}; claim that one.`);
    if (ref.screening_status !== 'included') throw new UnprocessableError(ref.screening_status === 'awaiting_full_text' ? 'This reference passed title and abstract screening; it is coded once its full text is included.' : 'Only references included at full-text screening are coded; screen it in first.');
    const active = await activeAssignmentOf(trx, referenceId);
    if (active) throw new ConflictError(`Reference ${referenceId} is already being double coded (assignment ${active.id}).`);
    const mine = await openSheetOf(trx, referenceId, actorId);
    if (mine) throw new ConflictError(`You already have a sheet for this reference (extraction ${mine.id}).`, { extractionId: mine.id });
    const [x] = await insertCodingSheets(trx, [{ referenceId, assignmentId: null, coderId: actorId, actorId }]);
    await recordAudit(trx, { actorId, action: 'extraction.claim', entityType: 'extraction', entityId: x.id, details: { referenceId } });
    return { id: x.id };
  });
}

/**
 * Who may read an extraction: its coder; for a settled record, anyone (drafts of a reopened record:
 * curators). Blind coding: while a pair is not settled, only a curator outside the pair may read a
 * coder's sheet — the other coder is 'blind' (they know it exists: the assignment names it).
 */
async function visibilityOf(db: Db, actor: Actor | null, x: ExtractionRow): Promise<'visible' | 'blind' | 'hidden'> {
  if (x.kind === 'settled') return x.state === 'draft' && !(actor && hasRole(actor.roles, 'curator')) ? 'hidden' : 'visible';
  if (!actor) return 'hidden';
  if (x.coder_id === actor.id) return 'visible';
  const a = x.assignment_id ? await findAssignment(db, x.assignment_id) : null;
  const settled = a?.state === 'settled' || x.state === 'settled';
  const inPair = a && (a.coder1_id === actor.id || a.coder2_id === actor.id);
  if (inPair && !settled) return 'blind';
  if (settled && hasRole(actor.roles, 'contributor')) return 'visible';
  return hasRole(actor.roles, 'curator') ? 'visible' : 'hidden';
}

/** Refusals answer exactly like a missing id (no 403 that reveals the record), except to the other coder of a pair, who knows it exists. */
async function assertCanRead(db: Db, actor: Actor | null, x: ExtractionRow) {
  const seen = await visibilityOf(db, actor, x);
  if (seen === 'hidden') throw new NotFoundError(`No extraction ${x.id}.`);
  if (seen === 'blind') throw new ForbiddenError('Coding is blind: you can see the other coder’s sheet once the pair is settled.');
}

/** Writes refuse a sheet the caller may not see like a missing id, before anything else can tell it apart. */
async function assertNotHidden(db: Db, actor: Actor, x: ExtractionRow) {
  if ((await visibilityOf(db, actor, x)) === 'hidden') throw new NotFoundError(`No extraction ${x.id}.`);
}

function extractionView(x: ExtractionDetailRow, editable: boolean): ExtractionDetail['extraction'] {
  return {
    id: x.id, kind: x.kind, state: x.state, version: x.version, recordVersion: x.record_version, assignmentId: x.assignment_id,
    referenceId: x.reference_id, reference: { id: x.reference_id, title: x.title, label: refLabel(x), doi: x.doi, year: x.year },
    coder: x.coder_login, updatedBy: x.updated_by_login, updatedAt: iso(x.updated_at), submittedAt: isoOrNull(x.submitted_at), settledAt: isoOrNull(x.settled_at),
    supersedesId: x.supersedes_id, supersededBy: x.superseded_by, reopenReason: x.reopen_reason, notes: x.notes, editable,
  };
}

export async function getExtraction(db: Knex, actor: Actor | null, id: number): Promise<ExtractionDetail> {
  const x = await findExtractionDetail(db, id);
  if (!x) throw new NotFoundError(`No extraction ${id}.`);
  await assertCanRead(db, actor, x);
  const editable = !!actor && x.state === 'draft' && ((x.kind === 'coding' && x.coder_id === actor.id) || (x.kind === 'settled' && hasRole(actor.roles, 'curator')));
  return { extraction: extractionView(x, editable), studies: await readSheet(db, id) };
}

async function lockEditable(trx: Knex.Transaction, actor: Actor, id: number, version: number) {
  const x = await lockExtraction(trx, id);
  if (!x) throw new NotFoundError(`No extraction ${id}.`);
  await assertNotHidden(trx, actor, x);
  const mine = x.kind === 'coding' ? x.coder_id === actor.id : hasRole(actor.roles, 'curator');
  if (!mine) throw new ForbiddenError(x.kind === 'coding' ? 'Only its coder can edit a coding sheet.' : 'Only curators edit a reopened record.');
  if (x.state !== 'draft') throw new ConflictError(`This sheet is ${x.state} and can no longer be edited.`);
  if (x.version !== version) throw await staleEdit(trx, 'This sheet', x);
  return x;
}

/** Saves a draft (also the autosave); the server recomputes every effect. */
export async function saveDraft(db: Knex, actor: Actor, id: number, input: { version: number; sheet: Sheet }): Promise<SavedSheet> {
  return db.transaction(async (trx) => {
    const x = await lockEditable(trx, actor, id, input.version);
    // A reopened record keeps its studies' identities by position; new studies get new ones.
    const studyIds = x.kind === 'settled' ? await stableStudyIds(trx, x.reference_id, input.sheet.studies.length, await studyIdsOf(trx, id)) : undefined;
    // A coder's effects from trial data take their numbers from the fits on this sheet.
    const sheet = x.kind === 'coding' ? await refreshDerivations(trx, id, input.sheet) : input.sheet;
    await saveSheet(trx, id, sheet, { studyIds, actorId: actor.id });
    const row = await updateExtraction(trx, id, { version: x.version + 1, notes: input.sheet.notes ?? '', updated_by: actor.id });
    await recordAudit(trx, {
      actorId: actor.id, action: 'extraction.save', entityType: 'extraction', entityId: id,
      details: { version: row.version, studies: input.sheet.studies.length, effects: input.sheet.studies.reduce((n, s) => n + s.effects.length, 0) },
    });
    return { version: row.version, updatedAt: iso(row.updated_at), studies: await readSheet(trx, id) };
  });
}

/**
 * Submits a coder's sheet. When it is the second of its pair to arrive, the two are compared: matched
 * pairs settle at once, disputed ones go to the reconciliation queue with their discrepancies.
 */
export async function submitExtraction(ctx: MailingDeps, actor: Actor, id: number, input: { version: number }): Promise<SubmitResult> {
  const mails: OutgoingMail[] = [];
  const origin = ctx.appOrigin;
  const result = await ctx.db.transaction(async (trx): Promise<SubmitResult> => {
    let peek = await findExtraction(trx, id);
    if (!peek) throw new NotFoundError(`No extraction ${id}.`);
    await assertNotHidden(trx, actor, peek);
    if (peek.kind !== 'coding') throw new UnprocessableError('A reopened record is settled, not submitted.');
    // A claim may be paired while it is submitted: the reference's lock orders the two (createAssignment takes it too).
    if (!peek.assignment_id) {
      await lockRef(trx, peek.reference_id);
      peek = (await findExtraction(trx, id))!;
    }
    // Lock the pair first so two coders submitting at once are compared exactly once.
    const assignment = peek.assignment_id ? await lockAssignment(trx, peek.assignment_id) : null;
    const x = await lockEditable(trx, actor, id, input.version);
    // a sheet is submitted only complete (the 400 names each missing field)
    parseCompleteSheet(toSheet(await readSheet(trx, id), x.notes));
    await updateExtraction(trx, id, { state: 'submitted', version: x.version + 1, updated_by: actor.id }, 'submitted');
    await recordAudit(trx, { actorId: actor.id, action: 'extraction.submit', entityType: 'extraction', entityId: id, details: { assignmentId: assignment?.id ?? null } });
    if (!assignment) return { state: 'submitted', pairState: null, discrepancies: 0 };
    const other = (await pairSheets(trx, assignment.id)).find((s) => s.id !== id);
    if (!other || other.state !== 'submitted') return { state: 'submitted', pairState: assignment.state, discrepancies: 0 };

    const compared = await comparePair(trx, origin, assignment, mails);
    return { state: compared.pairState, pairState: compared.pairState, discrepancies: compared.discrepancies, ...(compared.recordId ? { recordId: compared.recordId } : {}) };
  });
  await queueMails(ctx, mails);
  return result;
}
