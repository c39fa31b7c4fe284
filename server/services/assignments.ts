import type { Knex } from 'knex';
import { hasRole } from '../../shared/roles.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { AssignmentPage, CandidatePage, CoderList, CreatedAssignment } from '../../shared/schemas/reconciliation.js';
import type { MailingDeps } from './deps.js';
import { ConflictError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors.js';
import { activeAssignmentOf, insertAssignment, listAssignments as assignmentRows, listCandidates as candidateRows, setAssignmentState } from '../repositories/assignments.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, refLabel, type PageRequest } from '../repositories/db.js';
import { insertDiscrepancies } from '../repositories/discrepancies.js';
import { insertCodingSheets, joinPair, pairSheets, readSheet, setPairSheetsState, unpairedClaims } from '../repositories/extractions.js';
import { findRef, lockRef } from '../repositories/refs.js';
import type { AssignmentRow, AssignmentState, ExtractionState } from '../repositories/rows.js';
import { contactsOf, curatorIds, emailsWithRole, listCoders as coderRows, usersWithRoles } from '../repositories/users.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import { compareSheets } from './comparison.js';
import { assignmentMail, disputedMail, settledMail } from './extraction-mails.js';
import { queueMails, type OutgoingMail } from './mail.js';
import { createSettledRecord } from './settlement.js';

/**
 * A curator pairs two coders on a reference. Claims (sheets of the reference in no pair yet) join the pair as they
 * are: a draft keeps its values, and when both sheets are already submitted they are compared at once. Coders
 * without a claim get a fresh blind sheet. A claim by someone outside the pair is refused, so no work is set aside.
 */
export async function createAssignment(ctx: MailingDeps, actorId: number, input: { referenceId: number; coder1Id: number; coder2Id: number }): Promise<CreatedAssignment> {
  const mails: OutgoingMail[] = [];
  const result = await ctx.db.transaction(async (trx) => {
    // The reference's lock serializes pairings of one reference (and a claim's submission).
    const ref = await lockRef(trx, input.referenceId);
    if (!ref) throw new NotFoundError(`No reference ${input.referenceId}.`);
    if (ref.merged_into) throw new UnprocessableError(`Reference ${input.referenceId} was merged into ${ref.merged_into}; assign that one.`);
    const coders = await usersWithRoles(trx, [input.coder1Id, input.coder2Id]);
    for (const [key, id] of [['coder1Id', input.coder1Id], ['coder2Id', input.coder2Id]] as const) {
      const c = coders.find((x) => x.id === id);
      if (!c) throw new ValidationError(`No user ${id}.`, [{ path: `body.${key}`, message: 'no such user' }]);
      if (!hasRole(c.roles, 'contributor')) throw new ValidationError(`${c.login} is not a contributor and cannot code.`, [{ path: `body.${key}`, message: 'needs the contributor role' }]);
    }
    // Whoever codes a pair does not reconcile it: some curator must stand outside the pair.
    const reconcilers = (await curatorIds(trx)).filter((id) => id !== input.coder1Id && id !== input.coder2Id);
    if (!reconcilers.length) {
      const self = input.coder1Id === actorId ? 'coder1Id' : input.coder2Id === actorId ? 'coder2Id' : 'coder2Id';
      throw new UnprocessableError('No curator outside this pair could reconcile it: a curator who codes a pair may not settle it. Choose another coder, or ask an administrator to make a second person curator.', [
        { path: `body.${self}`, message: 'no other curator could reconcile this pair' },
      ]);
    }
    const active = await activeAssignmentOf(trx, input.referenceId);
    if (active) throw new ConflictError(`Reference ${input.referenceId} is already being double coded (assignment ${active.id}).`, { assignmentId: active.id });
    const claims = await unpairedClaims(trx, input.referenceId);
    const pair = [input.coder1Id, input.coder2Id];
    const outside = claims.filter((c) => !pair.includes(c.coder_id));
    if (outside.length) {
      const who = outside.map((c) => `@${c.login} (${c.state})`).join(', ');
      throw new UnprocessableError(`${who} already claimed this reference; choose them as one of the two coders so that work is not set aside.`, [
        { path: 'body.coder1Id', message: `claimed by ${who}` },
      ]);
    }
    const assignment = await insertAssignment(trx, { reference_id: input.referenceId, coder1_id: input.coder1Id, coder2_id: input.coder2Id, assigned_by: actorId }).catch((err: { code?: string }) => {
      // the unique partial index on active pairs: another request won the race
      if (err.code === '23505') throw new ConflictError(`Reference ${input.referenceId} is already being double coded.`);
      throw err;
    });
    await joinPair(trx, claims.map((c) => c.id), assignment.id);
    const fresh = pair.filter((coder) => !claims.some((c) => c.coder_id === coder));
    const created = await insertCodingSheets(trx, fresh.map((coderId) => ({ referenceId: input.referenceId, assignmentId: assignment.id, coderId, actorId })));
    const adopted = claims.map((c) => ({ extractionId: c.id, coderId: c.coder_id, coder: c.login, state: c.state }));
    await recordAudit(trx, { actorId, action: 'assignment.create', entityType: 'assignment', entityId: assignment.id, details: { ...input, adopted: adopted.map((c) => c.extractionId) } });
    const sheets = [...claims.map((c) => ({ id: c.id, coder_id: c.coder_id })), ...created];
    for (const c of coders) {
      const sheet = sheets.find((e) => e.coder_id === c.id)!;
      const claim = claims.find((x) => x.coder_id === c.id);
      mails.push(assignmentMail(ctx.appOrigin, { email: c.email, login: c.login, name: null }, ref, sheet.id, claim?.state ?? null));
    }
    const both = claims.filter((c) => c.state === 'submitted').length === 2;
    const compared = both ? await comparePair(trx, ctx.appOrigin, assignment, mails) : null;
    return { id: assignment.id, extractionIds: sheets.map((e) => e.id), state: compared?.pairState ?? assignment.state, adopted, discrepancies: compared?.discrepancies ?? 0 };
  });
  await queueMails(ctx, mails);
  return result;
}

/**
 * Compares the two submitted sheets of a pair: a match settles the record at once, a dispute goes to the
 * reconciliation queue with its discrepancies. Mails (coders on settling, curators on a dispute) are added to `mails`.
 */
export async function comparePair(trx: Knex.Transaction, appOrigin: string, assignment: AssignmentRow, mails: OutgoingMail[]): Promise<{ pairState: 'settled' | 'disputed'; discrepancies: number; recordId?: number }> {
  const xs = await pairSheets(trx, assignment.id);
  const sheetOf = async (coderId: number) => {
    const x = xs.find((s) => s.coder_id === coderId)!;
    return toSheet(await readSheet(trx, x.id), x.notes);
  };
  const first = await sheetOf(assignment.coder1_id);
  const second = await sheetOf(assignment.coder2_id);
  const found = compareSheets(first, second);
  const ref = (await findRef(trx, assignment.reference_id))!;
  if (found.length === 0) {
    const settled = await createSettledRecord(trx, {
      referenceId: assignment.reference_id, sheet: first, actorId: null, kind: 'matched', assignmentId: assignment.id,
      rationale: 'Both coders agreed on every compared field.',
    });
    await closePair(trx, assignment, 'settled');
    await recordAudit(trx, { actorId: null, action: 'assignment.matched', entityType: 'assignment', entityId: assignment.id, details: { recordId: settled.recordId } });
    for (const c of (await contactsOf(trx, [assignment.coder1_id, assignment.coder2_id])).values()) {
      mails.push(settledMail(appOrigin, c, ref, settled.recordId, 'Both codings agreed, so the record was settled automatically.'));
    }
    return { pairState: 'settled', discrepancies: 0, recordId: settled.recordId };
  }
  await insertDiscrepancies(trx, assignment.id, found);
  await closePair(trx, assignment, 'disputed');
  await recordAudit(trx, { actorId: null, action: 'assignment.disputed', entityType: 'assignment', entityId: assignment.id, details: { discrepancies: found.length } });
  for (const to of await emailsWithRole(trx, 'curator')) mails.push(disputedMail(appOrigin, to, ref, assignment.id, found));
  return { pairState: 'disputed', discrepancies: found.length };
}

/** Ends a pair's coding: both sheets and the pair take the verdict. */
export async function closePair(trx: Knex.Transaction, assignment: Pick<AssignmentRow, 'id' | 'version'>, state: AssignmentState & ExtractionState) {
  await setPairSheetsState(trx, assignment.id, state);
  await setAssignmentState(trx, assignment, state);
}

export async function listAssignments(db: Knex, q: PageRequest & { state?: AssignmentState; sort: 'id' | 'updated' | 'reference'; order: 'asc' | 'desc' }): Promise<AssignmentPage> {
  const { total, rows } = await assignmentRows(db, q);
  const items = rows.map((r) => ({
    id: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, state: r.state,
    coder1: r.coder1, coder2: r.coder2, submitted: r.submitted, openDiscrepancies: r.open_discrepancies,
    createdAt: iso(r.created_at), updatedAt: iso(r.updated_at),
  }));
  return pageOf(items, total, q);
}

/** Included references with their coding status, for a curator choosing what to assign. */
export async function listCandidates(db: Knex, q: PageRequest & { q?: string; status?: 'unassigned' | 'any'; sort: 'reference' | 'year' | 'id'; order: 'asc' | 'desc' }): Promise<CandidatePage> {
  const { total, rows } = await candidateRows(db, q);
  return pageOf(rows.map((r) => ({ id: r.id, title: r.title, referenceLabel: refLabel(r), year: r.year, doi: r.doi, assignmentState: r.assignment_state, settled: r.settled, claims: r.claims })), total, q);
}

export async function listCoders(db: Knex, actorId: number): Promise<CoderList> {
  const rows = await coderRows(db);
  const otherCurators = rows.filter((r) => r.curator && r.id !== actorId).map((r) => r.login);
  return { items: rows.map((r) => ({ id: r.id, login: r.login, name: r.name, curator: r.curator, you: r.id === actorId })), selfAssignable: otherCurators.length > 0, otherCurators };
}
