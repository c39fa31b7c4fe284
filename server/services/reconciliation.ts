// The reconciliation queue: a curator settles each discrepancy of a disputed pair, then the pair.
import type { Knex } from 'knex';
import { pageOf } from '../../shared/schemas/common.js';
import { effectDraftSchema, studyDraftSchema } from '../../shared/schemas/extraction.js';
import type { PairDetail, PairSide, ReconcilePairInput, ReconciledPair, ReconciliationQueue, ResolvedDiscrepancy, SettledRecord } from '../../shared/schemas/reconciliation.js';
import { tryComputeReported, type Reported } from '../../shared/extraction/compute.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import type { MailingDeps } from './deps.js';
import { ConflictError, ForbiddenError, NotFoundError, UnprocessableError, ValidationError } from '../lib/errors.js';
import { findPairDetail, listDisputed, lockAssignment, touchAssignment } from '../repositories/assignments.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull, refLabel, type PageRequest } from '../repositories/db.js';
import { discrepanciesOf, findDiscrepancy, resolveDiscrepancyRow } from '../repositories/discrepancies.js';
import type { DiscrepancyRow } from '../repositories/rows.js';
import { latestSettlementOfPair, pairSheets, readSheet, reopenedRecords } from '../repositories/extractions.js';
import { findRef } from '../repositories/refs.js';
import type { AssignmentRow } from '../repositories/rows.js';
import { contactsOf } from '../repositories/users.js';
import { closePair } from './assignments.js';
import { impliedEffects, mergeSheets } from './comparison.js';
import { settledMail } from './extraction-mails.js';
import { queueMails, type OutgoingMail } from './mail.js';
import { resolveManipulations } from './manipulations.js';
import { createSettledRecord } from './settlement.js';
import { fieldProblemInWords } from '../../shared/schemas/plain-words.js';

/** A coder of the pair may not read or settle its reconciliation (blind coding, independent settling). */
function refuseOwnPair(a: Pick<AssignmentRow, 'coder1_id' | 'coder2_id'>, actorId: number) {
  if (a.coder1_id === actorId || a.coder2_id === actorId) {
    throw new ForbiddenError('You coded this pair, so another curator reconciles it: the person who settles a dispute must not be one of its coders.');
  }
}

export async function listQueue(db: Knex, actorId: number, q: PageRequest & { sort: 'updated' | 'reference' | 'open'; order: 'asc' | 'desc' }): Promise<ReconciliationQueue> {
  const [{ total, rows }, reopened] = await Promise.all([listDisputed(db, q), reopenedRecords(db, 50)]);
  const items = rows.map((r) => ({
    assignmentId: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, coder1: r.coder1, coder2: r.coder2,
    openDiscrepancies: r.open_discrepancies, discrepancies: r.discrepancies, updatedAt: iso(r.updated_at), youCoded: r.coder1_id === actorId || r.coder2_id === actorId,
  }));
  return {
    ...pageOf(items, total, q),
    reopened: reopened.map((r) => ({
      recordId: r.id, referenceId: r.reference_id, referenceLabel: refLabel(r), title: r.title, recordVersion: r.record_version, reason: r.reopen_reason, updatedAt: iso(r.updated_at),
    })),
  };
}

export async function getPair(db: Knex, actorId: number, assignmentId: number): Promise<PairDetail> {
  const a = await findPairDetail(db, assignmentId);
  if (!a) throw new NotFoundError(`No assignment ${assignmentId}.`);
  refuseOwnPair(a, actorId);
  const [xs, discrepancies, settlement] = await Promise.all([pairSheets(db, assignmentId), discrepanciesOf(db, assignmentId), latestSettlementOfPair(db, assignmentId)]);
  const side = async (coderId: number, coder: string): Promise<PairSide | null> => {
    const x = xs.find((s) => s.coder_id === coderId);
    return x ? { extractionId: x.id, coder, state: x.state, studies: x.state === 'draft' ? [] : await readSheet(db, x.id) } : null;
  };
  const [sideA, sideB] = [await side(a.coder1_id, a.coder1), await side(a.coder2_id, a.coder2)];
  return {
    assignment: {
      id: a.id, state: a.state, version: a.version, referenceId: a.reference_id,
      reference: { id: a.reference_id, title: a.title, label: refLabel(a), doi: a.doi },
      coder1: a.coder1, coder2: a.coder2, recordId: settlement?.record_id ?? null,
    },
    a: sideA,
    b: sideB,
    discrepancies: discrepancies.map((d) => ({
      id: d.id, path: d.path, field: d.field, label: d.label, valueA: d.value_a, valueB: d.value_b,
      impliedA: impliedEffects(d.path, sideA?.studies ?? []), impliedB: impliedEffects(d.path, sideB?.studies ?? []), status: d.status,
      resolution: d.resolution, resolvedValue: d.resolved_value, rationale: d.rationale, resolvedBy: d.resolved_by_login, resolvedAt: isoOrNull(d.resolved_at),
    })),
  };
}

const STUDY_FIELDS = ['design', 'population', 'diagnosis', 'modality', 'task', 'n1', 'n2', 'standardMs'] as const;
type StudyField = (typeof STUDY_FIELDS)[number];
const isStudyField = (f: string): f is StudyField => (STUDY_FIELDS as readonly string[]).includes(f);

/** Checks a curator's own value for a field has the field's type and vocabulary (`at` names it in errors). */
function checkValue(field: string, value: unknown, at = 'body.value'): unknown {
  const name = at.replace(/^body\./, '');
  const fail = (message: string) => new ValidationError(fieldProblemInWords(name, message), [{ path: at, message }]);
  if (field === 'studies' || field === 'effects') throw new UnprocessableError('A count is settled by taking one coder’s list (a or b), not by entering a value.');
  if (isStudyField(field)) {
    const r = studyDraftSchema.shape[field].safeParse(value);
    if (!r.success) throw fail(r.error.issues[0].message);
    return r.data ?? null;
  }
  if (field === 'outcome' || field === 'manipulation' || field === 'parameter' || field === 'unit') {
    const r = effectDraftSchema.shape[field].safeParse(value);
    if (!r.success || r.data === undefined) throw fail(r.success ? 'enter a value' : r.error.issues[0].message);
    return r.data;
  }
  if (field === 'effect') {
    const r = effectDraftSchema.pick({ form: true, reported: true, assumedR: true }).safeParse(value);
    if (!r.success) throw fail(r.error.issues[0].message);
    if (!r.data.form) throw fail('choose how the result was reported');
    const c = tryComputeReported(r.data.form, r.data.reported as Reported, r.data.assumedR ?? null);
    if (!c.ok) throw new ValidationError(fieldProblemInWords(`${name}.reported${c.field ? `.${c.field}` : ''}`, c.error!), [{ path: `${at}.reported${c.field ? `.${c.field}` : ''}`, message: c.error! }]);
    return { form: r.data.form, reported: r.data.reported, assumedR: r.data.assumedR ?? null, metric: c.result!.metric, effect: c.result!.effect, variance: c.result!.variance };
  }
  throw fail(`no field ${field}`);
}

async function lockDisputed(trx: Knex.Transaction, actorId: number, assignmentId: number, doing: string): Promise<AssignmentRow> {
  const a = await lockAssignment(trx, assignmentId);
  if (!a) throw new NotFoundError(`No assignment ${assignmentId}.`);
  refuseOwnPair(a, actorId);
  if (a.state !== 'disputed') throw new ConflictError(`This pair is ${a.state}; only disputed pairs are ${doing}.`);
  return a;
}

export async function resolveDiscrepancy(db: Knex, actorId: number, assignmentId: number, discrepancyId: number, input: { resolution: 'a' | 'b' | 'value'; value?: unknown; rationale: string }): Promise<ResolvedDiscrepancy> {
  return db.transaction(async (trx) => {
    const a = await lockDisputed(trx, actorId, assignmentId, 'reconciled');
    const d = await findDiscrepancy(trx, assignmentId, discrepancyId);
    if (!d) throw new NotFoundError(`No discrepancy ${discrepancyId} in assignment ${assignmentId}.`);
    const row = await decide(trx, actorId, assignmentId, d, input);
    await touchAssignment(trx, a);
    return { discrepancy: { id: row.id, status: row.status, resolution: row.resolution, resolvedValue: row.resolved_value, rationale: row.rationale } };
  });
}

/** Records one field's decision (the chosen side's value or the curator's own, checked) and audits it. */
async function decide(trx: Knex.Transaction, actorId: number, assignmentId: number, d: DiscrepancyRow, input: { resolution: 'a' | 'b' | 'value'; value?: unknown; rationale: string }, at?: string) {
  if (input.resolution === 'value' && d.field === 'manipulation') await resolveManipulations(trx, [String(input.value)]);
  const value = input.resolution === 'a' ? d.value_a : input.resolution === 'b' ? d.value_b : checkValue(d.field, input.value, at);
  const row = await resolveDiscrepancyRow(trx, d.id, { resolution: input.resolution, value, rationale: input.rationale, actorId });
  await recordAudit(trx, { actorId, action: 'discrepancy.resolve', entityType: 'discrepancy', entityId: d.id, details: { assignmentId, path: d.path, resolution: input.resolution, value, rationale: input.rationale } });
  return row;
}

/** Settles a disputed pair once every discrepancy is resolved: coder A's sheet with each resolution applied. */
export async function settlePair(ctx: MailingDeps, actorId: number, assignmentId: number, input: { rationale: string }): Promise<SettledRecord> {
  const mails: OutgoingMail[] = [];
  const out = await ctx.db.transaction(async (trx) => {
    const a = await lockDisputed(trx, actorId, assignmentId, 'settled here');
    return settleResolved(trx, ctx, a, actorId, input.rationale, mails, {});
  });
  await queueMails(ctx, mails);
  return out;
}

/**
 * Reconciles a disputed pair in one step: every field's decision (coder A, coder B or the curator's own value) and
 * the settled record in one transaction, against the pair's version the curator read.
 */
export async function reconcilePair(ctx: MailingDeps, actorId: number, assignmentId: number, input: ReconcilePairInput): Promise<ReconciledPair> {
  const mails: OutgoingMail[] = [];
  const out = await ctx.db.transaction(async (trx) => {
    const a = await lockDisputed(trx, actorId, assignmentId, 'reconciled');
    if (a.version !== input.version) throw new ConflictError(`This pair changed since you opened it (version ${input.version}, now ${a.version}): reload it to see the decisions made since.`);
    const ds = new Map((await discrepanciesOf(trx, assignmentId)).map((d) => [d.id, d]));
    const unknown = input.decisions.flatMap((x, i) => (ds.has(x.discrepancyId) ? [] : [{ path: `body.decisions.${i}.discrepancyId`, message: `no discrepancy ${x.discrepancyId} in this pair` }]));
    if (unknown.length) throw new ValidationError(`Decisions: ${unknown.map((u) => u.message).join('; ')}.`, unknown);
    const decided = new Set(input.decisions.map((x) => x.discrepancyId));
    const missing = [...ds.values()].filter((d) => d.status === 'open' && !decided.has(d.id));
    if (missing.length) {
      throw new UnprocessableError(`Decide every differing field: ${missing.length} left open (${missing.map((d) => d.label).join('; ')}).`, missing.map((d) => ({ id: d.id, path: d.path })));
    }
    for (const [i, x] of input.decisions.entries()) {
      await decide(trx, actorId, assignmentId, ds.get(x.discrepancyId)!, { resolution: x.resolution, value: x.value, rationale: x.note || input.rationale }, `body.decisions.${i}.value`);
    }
    const settled = await settleResolved(trx, ctx, a, actorId, input.rationale, mails, { decided: input.decisions.length, oneStep: true });
    return { ...settled, assignmentId, decided: input.decisions.length };
  });
  await queueMails(ctx, mails);
  return out;
}

/** The settled record of a locked pair whose every discrepancy is resolved; the pair closes, the coders get mail. */
async function settleResolved(trx: Knex.Transaction, ctx: MailingDeps, a: AssignmentRow, actorId: number, note: string, mails: OutgoingMail[], audit: Record<string, unknown>): Promise<SettledRecord> {
  const ds = await discrepanciesOf(trx, a.id);
  const open = ds.filter((d) => d.status !== 'resolved');
  if (open.length) throw new UnprocessableError(`${open.length} discrepanc${open.length === 1 ? 'y is' : 'ies are'} still open: ${open.map((d) => d.label).join('; ')}.`, open.map((d) => ({ id: d.id, path: d.path })));
  const xs = await pairSheets(trx, a.id);
  const sheetOf = async (coderId: number) => {
    const x = xs.find((s) => s.coder_id === coderId)!;
    return toSheet(await readSheet(trx, x.id), x.notes);
  };
  const merged = mergeSheets(await sheetOf(a.coder1_id), await sheetOf(a.coder2_id), ds.map((d) => ({ path: d.path, field: d.field, value: d.resolved_value, structural: d.resolution === 'value' ? null : d.resolution })));
  const rationale = [note, ...ds.map((d) => `${d.label}: ${d.resolution === 'value' ? 'own value' : `coder ${d.resolution!.toUpperCase()}`} — ${d.rationale}`)].filter(Boolean).join('\n');
  const settled = await createSettledRecord(trx, { referenceId: a.reference_id, sheet: merged, actorId, kind: 'reconciled', assignmentId: a.id, rationale });
  await closePair(trx, a, 'settled');
  await recordAudit(trx, { actorId, action: 'assignment.settle', entityType: 'assignment', entityId: a.id, details: { recordId: settled.recordId, rationale: note, ...audit } });
  const ref = (await findRef(trx, a.reference_id))!;
  for (const c of (await contactsOf(trx, [a.coder1_id, a.coder2_id])).values()) mails.push(settledMail(ctx.appOrigin, c, ref, settled.recordId, 'A curator reconciled the two codings.'));
  return settled;
}
