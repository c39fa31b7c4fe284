import type { Knex } from 'knex';
import { hasRole } from '../../shared/roles.js';
import { pageOf } from '../../shared/schemas/common.js';
import type { AssignmentPage, CandidatePage, CoderList, CreatedAssignment } from '../../shared/schemas/reconciliation.js';
import type { MailingDeps } from './deps.js';
import { ConflictError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors.js';
import { activeAssignmentOf, insertAssignment, listAssignments as assignmentRows, listCandidates as candidateRows, setAssignmentState } from '../repositories/assignments.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, refLabel, type PageRequest } from '../repositories/db.js';
import { insertCodingSheets, joinPair, setPairSheetsState, unpairedClaims } from '../repositories/extractions.js';
import { findRef } from '../repositories/refs.js';
import type { AssignmentRow, AssignmentState, ExtractionState } from '../repositories/rows.js';
import { listCoders as coderRows, usersWithRoles } from '../repositories/users.js';
import { assignmentMail } from './extraction-mails.js';
import { queueMails } from './mail.js';

/** A curator pairs two coders on a reference; each gets a blind coding sheet (a coder's earlier claim joins the pair). */
export async function createAssignment(ctx: MailingDeps, actorId: number, input: { referenceId: number; coder1Id: number; coder2Id: number }): Promise<CreatedAssignment> {
  const result = await ctx.db.transaction(async (trx) => {
    const ref = await findRef(trx, input.referenceId);
    if (!ref) throw new NotFoundError(`No reference ${input.referenceId}.`);
    if (ref.merged_into) throw new UnprocessableError(`Reference ${input.referenceId} was merged into ${ref.merged_into}; assign that one.`);
    const coders = await usersWithRoles(trx, [input.coder1Id, input.coder2Id]);
    for (const [key, id] of [['coder1Id', input.coder1Id], ['coder2Id', input.coder2Id]] as const) {
      const c = coders.find((x) => x.id === id);
      if (!c) throw new ValidationError(`No user ${id}.`, [{ path: `body.${key}`, message: 'no such user' }]);
      if (!hasRole(c.roles, 'contributor')) throw new ValidationError(`${c.login} is not a contributor and cannot code.`, [{ path: `body.${key}`, message: 'needs the contributor role' }]);
    }
    const active = await activeAssignmentOf(trx, input.referenceId);
    if (active) throw new ConflictError(`Reference ${input.referenceId} is already being double coded (assignment ${active.id}).`);
    const assignment = await insertAssignment(trx, { reference_id: input.referenceId, coder1_id: input.coder1Id, coder2_id: input.coder2Id, assigned_by: actorId });
    // A coder who already claimed the reference keeps that sheet; it joins the pair.
    const claimed = await unpairedClaims(trx, input.referenceId, [input.coder1Id, input.coder2Id]);
    await joinPair(trx, claimed.map((c) => c.id), assignment.id);
    const fresh = [input.coder1Id, input.coder2Id].filter((coder) => !claimed.some((c) => c.coder_id === coder));
    const created = await insertCodingSheets(trx, fresh.map((coderId) => ({ referenceId: input.referenceId, assignmentId: assignment.id, coderId, actorId })));
    await recordAudit(trx, { actorId, action: 'assignment.create', entityType: 'assignment', entityId: assignment.id, details: input });
    return { assignment, extractions: [...claimed, ...created], ref, coders };
  });
  await queueMails(
    ctx,
    result.coders.map((c) => assignmentMail(ctx.appOrigin, { email: c.email, login: c.login, name: null }, result.ref, result.extractions.find((e) => e.coder_id === c.id)!.id)),
  );
  return { id: result.assignment.id, extractionIds: result.extractions.map((e) => e.id) };
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
  return pageOf(rows.map((r) => ({ id: r.id, title: r.title, referenceLabel: refLabel(r), year: r.year, doi: r.doi, assignmentState: r.assignment_state, settled: r.settled })), total, q);
}

export async function listCoders(db: Knex): Promise<CoderList> {
  return { items: (await coderRows(db)).map((r) => ({ id: r.id, login: r.login, name: r.name })) };
}
