// Settled records after settlement: their history, reopening, settling a reopened version, withdrawal, and a
// curator's correction or withdrawal of one settled effect.
import type { Knex } from 'knex';
import type { EffectSheet, ExtractionDetail } from '../../shared/schemas/extraction.js';
import type { RecordHistory, RecordVersionResult, WithdrawnRecord } from '../../shared/schemas/reconciliation.js';
import type { EditedEffect, WithdrawnEffect } from '../../shared/schemas/registry.js';
import { OUTCOMES, METRIC_LABELS } from '../../shared/vocabulary/outcomes.js';
import { METRICS_OF_FORM, tryComputeReported, type Reported } from '../../shared/extraction/compute.js';
import { orientAttempt } from '../../shared/extraction/orientation.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import type { MailingDeps } from './deps.js';
import { ConflictError, NotFoundError, ValidationError } from '../lib/errors.js';
import { findAssignment } from '../repositories/assignments.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, isoOrNull } from '../repositories/db.js';
import { effectColumns } from '../repositories/effect-columns.js';
import { lockEffect, markEffectWithdrawn, taskOfEffectStudy, updateEffect } from '../repositories/effects.js';
import { findExtraction, insertExtraction, insertSettlement, lockExtraction, readSheet, recordsOf, settlementsOf, updateExtraction } from '../repositories/extractions.js';
import { findRef } from '../repositories/refs.js';
import { bumpRegistry } from '../repositories/registry-version.js';
import type { EffectRow, ExtractionRow } from '../repositories/rows.js';
import { contactsOf } from '../repositories/users.js';
import { getExtraction, type Actor } from './coding.js';
import { staleEdit } from './edit-conflicts.js';
import { settledMail } from './extraction-mails.js';
import { queueMails, type OutgoingMail } from './mail.js';
import { resolveManipulations } from './manipulations.js';
import { assertQuantities } from './quantities.js';
import { parseCompleteSheet, saveSheet } from './settlement.js';
import { fieldProblemInWords } from '../../shared/schemas/plain-words.js';

export async function listRecords(db: Knex, referenceId: number): Promise<RecordHistory> {
  const [rows, settlements] = await Promise.all([recordsOf(db, referenceId), settlementsOf(db, referenceId)]);
  return {
    records: rows.map((r) => ({ id: r.id, state: r.state, recordVersion: r.record_version, current: r.superseded_by == null, supersededBy: r.superseded_by, reopenReason: r.reopen_reason, settledAt: isoOrNull(r.settled_at), createdAt: iso(r.created_at), updatedBy: r.updated_by })),
    settlements: settlements.map((s) => ({ id: s.id, recordId: s.record_id, kind: s.kind, by: s.login, rationale: s.rationale, at: iso(s.at) })),
  };
}

/** One version of a reference's settled record (a coder's sheet is not a record). */
export async function getRecord(db: Knex, actor: Actor | null, id: number): Promise<ExtractionDetail> {
  const record = await getExtraction(db, actor, id);
  if (record.extraction.kind !== 'settled') throw new NotFoundError(`No settled record ${id}.`);
  return record;
}

async function lockCurrentSettled(trx: Knex.Transaction, recordId: number): Promise<ExtractionRow> {
  const x = await lockExtraction(trx, recordId);
  if (!x || x.kind !== 'settled') throw new NotFoundError(`No settled record ${recordId}.`);
  if (x.superseded_by) throw new ConflictError(`Record ${recordId} is an old version (superseded by ${x.superseded_by}).`);
  return x;
}

/** Reopens a settled record: a new draft version (curators edit, then settle it) replaces it in analyses; the old is kept. */
export async function reopenRecord(db: Knex, actorId: number, recordId: number, reason: string): Promise<RecordVersionResult> {
  return db.transaction(async (trx) => {
    const x = await lockCurrentSettled(trx, recordId);
    if (x.state !== 'settled') throw new ConflictError(`Record ${recordId} is ${x.state}; only a settled record can be reopened.`);
    const draft = await insertExtraction(trx, {
      reference_id: x.reference_id, assignment_id: x.assignment_id, kind: 'settled', coder_id: null, state: 'draft',
      record_version: x.record_version! + 1, supersedes_id: x.id, reopen_reason: reason, notes: x.notes, updated_by: actorId,
    });
    // Withdrawn effects stay out of the new version.
    const studies = (await readSheet(trx, x.id)).map((s) => ({ ...s, effects: s.effects.filter((e) => !e.withdrawnReason) }));
    await saveSheet(trx, draft.id, toSheet(studies, x.notes), { studyIds: studies.map((s) => s.studyId), actorId });
    await updateExtraction(trx, x.id, { superseded_by: draft.id });
    await insertSettlement(trx, { referenceId: x.reference_id, assignmentId: x.assignment_id, recordId: x.id, kind: 'reopened', actorId, rationale: reason });
    await recordAudit(trx, { actorId, action: 'record.reopen', entityType: 'extraction', entityId: x.id, details: { reason, newVersionId: draft.id } });
    const registryVersion = await bumpRegistry(trx, { kind: 'reopen', referenceId: x.reference_id, extractionId: x.id, actorId, details: { reason } });
    return { recordId: draft.id, recordVersion: draft.record_version!, registryVersion };
  });
}

/** Settles a reopened draft version (curators). */
export async function settleRecordDraft(ctx: MailingDeps, actorId: number, recordId: number, input: { rationale: string; version?: number }): Promise<RecordVersionResult> {
  const mails: OutgoingMail[] = [];
  const out = await ctx.db.transaction(async (trx) => {
    const x = await lockCurrentSettled(trx, recordId);
    if (x.state !== 'draft') throw new ConflictError(`Record ${recordId} is ${x.state}, not a reopened draft.`);
    if (input.version !== undefined && input.version !== x.version) throw await staleEdit(trx, 'This record', x);
    parseCompleteSheet(toSheet(await readSheet(trx, recordId), x.notes));
    await updateExtraction(trx, recordId, { state: 'settled', version: x.version + 1, updated_by: actorId }, 'settled');
    await insertSettlement(trx, { referenceId: x.reference_id, assignmentId: x.assignment_id, recordId, kind: 'reconciled', actorId, rationale: input.rationale });
    await recordAudit(trx, { actorId, action: 'record.settle', entityType: 'extraction', entityId: recordId, details: { kind: 'reopened-version', recordVersion: x.record_version, rationale: input.rationale } });
    const registryVersion = await bumpRegistry(trx, { kind: 'settle.reopened', referenceId: x.reference_id, extractionId: recordId, actorId });
    const a = x.assignment_id ? await findAssignment(trx, x.assignment_id) : undefined;
    if (a) {
      const ref = (await findRef(trx, x.reference_id))!;
      const how = `A curator settled version ${x.record_version} after reopening it (${x.reopen_reason}).`;
      for (const c of (await contactsOf(trx, [a.coder1_id, a.coder2_id])).values()) mails.push(settledMail(ctx.appOrigin, c, ref, recordId, how));
    }
    return { recordId, recordVersion: x.record_version!, registryVersion };
  });
  await queueMails(ctx, mails);
  return out;
}

export async function withdrawRecord(db: Knex, actorId: number, recordId: number, reason: string): Promise<WithdrawnRecord> {
  return db.transaction((trx) => withdrawRecordIn(trx, actorId, recordId, reason));
}

/** Withdraws a settled record inside the caller's transaction (a screening exclusion withdraws several). */
export async function withdrawRecordIn(trx: Knex.Transaction, actorId: number, recordId: number, reason: string): Promise<WithdrawnRecord> {
  const x = await lockCurrentSettled(trx, recordId);
  if (x.state === 'withdrawn') throw new ConflictError(`Record ${recordId} is already withdrawn.`);
  await updateExtraction(trx, recordId, { state: 'withdrawn', version: x.version + 1, updated_by: actorId });
  await insertSettlement(trx, { referenceId: x.reference_id, assignmentId: x.assignment_id, recordId, kind: 'withdrawn', actorId, rationale: reason });
  await recordAudit(trx, { actorId, action: 'record.withdraw', entityType: 'extraction', entityId: recordId, details: { reason } });
  const registryVersion = await bumpRegistry(trx, { kind: 'withdraw', referenceId: x.reference_id, extractionId: recordId, actorId, details: { reason } });
  return { recordId, state: 'withdrawn' as const, registryVersion };
}

/**
 * Settles again the records a screening exclusion withdrew (its undo), inside the caller's transaction: one registry
 * change for all. Refuses, in words, when any of them is no longer the reference's withdrawn current record or
 * another settled record of the reference took its place. Returns the new registry version.
 */
export async function restoreWithdrawnRecordsIn(trx: Knex.Transaction, actorId: number, referenceId: number, recordIds: number[], reason: string): Promise<number> {
  const rows: ExtractionRow[] = await trx('extractions').whereIn('id', recordIds).orderBy('id').forUpdate().select('*');
  for (const id of recordIds) {
    const x = rows.find((r) => r.id === id);
    const cannot = `Record ${id}, withdrawn by this exclusion,`;
    if (!x || x.kind !== 'settled' || x.reference_id !== referenceId) throw new ConflictError(`${cannot} no longer belongs to reference ${referenceId}; the exclusion cannot be undone.`, { recordId: id });
    if (x.superseded_by) throw new ConflictError(`${cannot} was replaced by record ${x.superseded_by}; the exclusion cannot be undone.`, { recordId: id });
    if (x.state !== 'withdrawn') throw new ConflictError(`${cannot} is ${x.state} now, not withdrawn; the exclusion cannot be undone.`, { recordId: id });
  }
  const others: { id: number }[] = await trx('extractions')
    .where({ reference_id: referenceId, kind: 'settled', state: 'settled' })
    .whereNull('superseded_by')
    .whereNotIn('id', recordIds)
    .select('id');
  if (others.length)
    throw new ConflictError(`Reference ${referenceId} has been settled again since the exclusion (record ${others[0].id}); restoring the withdrawn record would count its effects twice, so the exclusion cannot be undone.`, { settledRecords: others.map((o) => o.id) });
  for (const x of rows) {
    await updateExtraction(trx, x.id, { state: 'settled', version: x.version + 1, updated_by: actorId });
    await insertSettlement(trx, { referenceId, assignmentId: x.assignment_id, recordId: x.id, kind: 'restored', actorId, rationale: reason });
    await recordAudit(trx, { actorId, action: 'record.restore', entityType: 'extraction', entityId: x.id, details: { reason } });
  }
  return bumpRegistry(trx, { kind: 'restore', referenceId, actorId, details: { reason, records: recordIds } });
}

/** Locks a settled effect and its record; refuses effects outside the current settled registry. */
async function lockSettledEffect(trx: Knex.Transaction, effectId: number): Promise<{ f: EffectRow; x: ExtractionRow }> {
  const f = await lockEffect(trx, effectId);
  if (!f) throw new NotFoundError(`No effect ${effectId}.`);
  const x = (await findExtraction(trx, f.extraction_id))!;
  if (x.kind !== 'settled' || x.state !== 'settled' || x.superseded_by) throw new ConflictError(`Effect ${effectId} is not part of a current settled record.`);
  return { f, x };
}

/** A curator's correction of one settled effect: recomputed on the server, versioned, audited, and a registry change. */
export async function editSettledEffect(db: Knex, actorId: number, effectId: number, input: { version: number; reason: string; effect: EffectSheet }): Promise<EditedEffect> {
  return db.transaction(async (trx) => {
    const { f, x } = await lockSettledEffect(trx, effectId);
    if (f.version !== input.version) throw await staleEdit(trx, `Effect ${effectId}`, f);
    // an edit that names no parameter (or unit) keeps the stored one while the outcome kind (or parameter) stays
    const keptParameter = input.effect.parameter ?? (input.effect.outcome === f.outcome ? (f.parameter ?? undefined) : undefined);
    const keptUnit = input.effect.unit ?? (keptParameter !== undefined && keptParameter === f.parameter ? (f.unit ?? undefined) : undefined);
    const e = { ...input.effect, parameter: keptParameter, unit: keptUnit };
    const problems: { path: string; message: string }[] = [];
    if (!e.outcome) problems.push({ path: 'body.effect.outcome', message: 'choose an outcome kind' });
    if (!e.manipulation) problems.push({ path: 'body.effect.manipulation', message: 'choose a manipulation' });
    if (!e.form) problems.push({ path: 'body.effect.form', message: 'choose how the result was reported' });
    const task = await taskOfEffectStudy(trx, f);
    const c = e.form ? orientAttempt(tryComputeReported(e.form, e.reported as Reported, e.assumedR ?? null), e, task) : null;
    if (c && !c.ok) problems.push({ path: `body.effect.reported${c.field ? `.${c.field}` : ''}`, message: c.error! });
    const metrics = c?.ok ? [c.result!.metric] : e.form ? METRICS_OF_FORM[e.form] : [];
    if (e.outcome && metrics.length && !metrics.some((m) => OUTCOMES[e.outcome!].metrics.includes(m)))
      problems.push({ path: 'body.effect.form', message: `${OUTCOMES[e.outcome].label} is not pooled as ${metrics.map((m) => METRIC_LABELS[m]).join(' or ')}` });
    if (problems.length) throw new ValidationError(fieldProblemInWords(problems[0].path, problems[0].message), problems);
    assertQuantities([{ at: '', label: `Effect ${effectId}`, effect: e }], 'body.effect.');
    const ids = await resolveManipulations(trx, [e.manipulation!]);
    const before = { outcome: f.outcome, parameter: f.parameter, unit: f.unit, manipulationId: f.manipulation_id, form: f.report_form, reported: f.reported, effect: f.effect, variance: f.variance };
    const r = c!.result!;
    const row = await updateEffect(trx, f, effectColumns({ ...e, label: e.label ?? f.label }, ids.get(e.manipulation!)!, r, f), actorId);
    await insertSettlement(trx, { referenceId: x.reference_id, assignmentId: x.assignment_id, recordId: x.id, kind: 'edited', actorId, rationale: input.reason });
    await recordAudit(trx, { actorId, action: 'effect.edit', entityType: 'effect', entityId: effectId, details: { reason: input.reason, before, after: { effect: r.effect, variance: r.variance, form: e.form, parameter: row.parameter, unit: row.unit } } });
    const registryVersion = await bumpRegistry(trx, { kind: 'effect.edit', referenceId: x.reference_id, extractionId: x.id, effectId, actorId, details: { reason: input.reason } });
    return { id: row.id, version: row.version, effect: r.effect, variance: r.variance, metric: r.metric, formula: r.formula, registryVersion };
  });
}

/** Withdraws one settled effect (it leaves every analysis; the row and its history stay). */
export async function withdrawEffect(db: Knex, actorId: number, effectId: number, reason: string): Promise<WithdrawnEffect> {
  return db.transaction(async (trx) => {
    const { f, x } = await lockSettledEffect(trx, effectId);
    if (f.withdrawn_at) throw new ConflictError(`Effect ${effectId} is already withdrawn.`);
    await markEffectWithdrawn(trx, f, reason, actorId);
    await insertSettlement(trx, { referenceId: x.reference_id, assignmentId: x.assignment_id, recordId: x.id, kind: 'withdrawn', actorId, rationale: `effect ${effectId}: ${reason}` });
    await recordAudit(trx, { actorId, action: 'effect.withdraw', entityType: 'effect', entityId: effectId, details: { reason } });
    const registryVersion = await bumpRegistry(trx, { kind: 'effect.withdraw', referenceId: x.reference_id, extractionId: x.id, effectId, actorId, details: { reason } });
    return { id: effectId, withdrawn: true as const, registryVersion };
  });
}
