import type { Knex } from 'knex';
import type {
  PrismaFlow, ScreeningBatchDecisionInput, ScreeningBatchResult, ScreeningBatchUndoInput, ScreeningBatchUndoResult, ScreeningDecisionInput, ScreeningQueue, ScreeningResult, ScreeningUndoInput, ScreeningUndoResult,
} from '../../shared/schemas/references.js';
import { hasRole, type Role } from '../../shared/roles.js';
import {
  EXCLUSION_REASONS, EXCLUSION_REASON_LABELS, NO_REASON, SCREENING_STAGES, type ScreeningStatus, STAGE_REASONS, stageOf, statusAfter, type ScreeningStage,
} from '../../shared/vocabulary/screening.js';
import { ConflictError, ForbiddenError, NotFoundError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, type Db } from '../repositories/db.js';
import { creatingBatchesOf, duplicateEntriesByFormat } from '../repositories/imports.js';
import { attachmentsOfRefs, lockRef, refCounts, refsAwaiting, updateRef } from '../repositories/refs.js';
import { decisionsOf, exclusionReasonCounts, insertDecision, markUndone } from '../repositories/screening.js';
import { lockSettledRecordsOf } from '../repositories/settled-effects.js';
import type { Actor } from './coding.js';
import { restoreWithdrawnRecordsIn, withdrawRecordIn } from './records.js';
import { summary } from './references.js';
import { checkReason, STAGE_WORD, WAITING_AT } from './screening-words.js';
import { isCurator, recordVoteIn, reopenVotesOf, supersedeOpenVotes, takeBackOwnVote } from './screening-votes.js';
import { openVoteSummary, awaitingScreener, screeningRule } from '../repositories/screening-votes.js';

/**
 * Records a decision (the history keeps every one; the reference shows the latest) against the reference version
 * the screener saw. Excluding a reference whose effects are settled is a curator's call: it withdraws those
 * records with the exclusion as the reason, in the same transaction.
 */
export async function decide(db: Knex, refId: number, input: ScreeningDecisionInput, actor: Actor): Promise<ScreeningResult> {
  return db.transaction((trx) => decideIn(trx, refId, input, actor));
}

async function decideIn(trx: Knex.Transaction, refId: number, input: ScreeningDecisionInput, actor: Actor): Promise<ScreeningResult> {
  const r = await lockRef(trx, refId);
  if (!r) throw new NotFoundError(`There is no reference ${refId}.`);
  if (r.merged_into) throw new ConflictError(`Reference ${refId} was merged into reference ${r.merged_into}; screen that one.`, { mergedInto: r.merged_into });
  const [last] = await decisionsOf(trx, refId);
  if (r.version !== input.version) {
    const now = last ? `, now ${last.decision} at ${STAGE_WORD[last.stage]} by ${last.login ?? 'someone'} at ${iso(last.decided_at).slice(0, 16).replace('T', ' ')} UTC` : '';
    throw new ConflictError(`Reference ${refId} changed since you opened it (version ${r.version}${now}); reload it before deciding.`, {
      currentVersion: r.version,
      screeningStatus: r.screening_status,
    });
  }
  const stage = stageOf(r.screening_status, last?.stage ?? null);
  if (input.stage && input.stage !== stage)
    throw new ConflictError(`Reference ${refId} is at the ${STAGE_WORD[stage]} stage now, not ${STAGE_WORD[input.stage]}; reload it before deciding.`, {
      currentVersion: r.version,
      screeningStatus: r.screening_status,
      stage,
    });
  checkReason(refId, stage, input);
  const rule = await screeningRule(trx);
  if (rule.screeners === 2 && r.screening_status === WAITING_AT[stage]) return recordVoteIn(trx, r, stage, input, actor);
  if (rule.screeners === 2 && !isCurator(actor))
    throw new ConflictError(`Reference ${refId} is settled at the ${STAGE_WORD[stage]} stage; under the two-screener rule only a curator may change a settled decision.`, {
      currentVersion: r.version,
      screeningStatus: r.screening_status,
    });
  await supersedeOpenVotes(trx, refId, stage);
  const withdrawnRecords = input.decision === 'excluded' ? await lockSettledRecordsOf(trx, refId) : [];
  if (withdrawnRecords.length && !hasRole(actor.roles, 'curator'))
    throw new ForbiddenError(`Reference ${refId} has settled effects; only a curator may exclude it (that withdraws them).`);
  const row = await insertDecision(trx, { ref_id: refId, stage, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decided_by: actor.id, withdrawn_records: withdrawnRecords });
  const screeningStatus = statusAfter(stage, input.decision);
  await updateRef(trx, refId, { screening_status: screeningStatus, version: r.version + 1 });
  let registryVersion: number | null = null;
  const why = `Excluded at ${STAGE_WORD[stage]} screening: ${input.reason ? EXCLUSION_REASON_LABELS[input.reason] : 'no reason given'}${input.note ? ` (${input.note})` : ''}`;
  for (const id of withdrawnRecords) registryVersion = (await withdrawRecordIn(trx, actor.id, id, why)).registryVersion;
  await recordAudit(trx, {
    actorId: actor.id,
    action: 'screening.decide',
    entityType: 'reference',
    entityId: refId,
    details: { stage, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, previous: r.screening_status, withdrawnRecords },
  });
  return {
    id: row.id, refId, stage, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decidedAt: iso(row.decided_at),
    screeningStatus, version: r.version + 1, withdrawnRecords, registryVersion, dual: null,
  };
}

/** Includes a reference at title/abstract and then at full text (the demo seed's papers, which are coded). */
export async function includeThroughFullText(db: Knex, refId: number, actor: Actor, version = 1): Promise<ScreeningResult> {
  return db.transaction(async (trx) => {
    const first = await decideIn(trx, refId, { decision: 'included', stage: 'title_abstract', version }, actor);
    return decideIn(trx, refId, { decision: 'included', stage: 'full_text', version: first.version }, actor);
  });
}

/**
 * One decision for several references at once, each against the version its screener saw, in one transaction:
 * a refusal for any of them (stale, merged, settled effects) refuses them all, naming that reference.
 */
export async function decideMany(db: Knex, input: ScreeningBatchDecisionInput, actor: Actor): Promise<ScreeningBatchResult> {
  const { items, ...decision } = input;
  return db.transaction(async (trx) => {
    const results: ScreeningResult[] = [];
    // In id order, so two overlapping batches lock their references in the same order.
    for (const it of [...items].sort((a, b) => a.refId - b.refId)) results.push(await decideIn(trx, it.refId, { ...decision, version: it.version }, actor));
    const order = new Map(items.map((it, i) => [it.refId, i]));
    return { results: results.sort((a, b) => order.get(a.refId)! - order.get(b.refId)!) };
  });
}

/** Takes back the latest decision of several references in one transaction (a batch decision, undone as one). */
export async function undoMany(db: Knex, input: ScreeningBatchUndoInput, actor: { id: number; roles: Role[] }): Promise<ScreeningBatchUndoResult> {
  return db.transaction(async (trx) => {
    const results: ScreeningUndoResult[] = [];
    for (const it of [...input.items].sort((a, b) => a.refId - b.refId)) results.push(await undoIn(trx, it.refId, { version: it.version }, actor));
    const order = new Map(input.items.map((it, i) => [it.refId, i]));
    return { results: results.sort((a, b) => order.get(a.refId)! - order.get(b.refId)!) };
  });
}

/**
 * Takes back the reference's latest decision: it stops counting (kept in the table, marked undone, audited) and the
 * reference returns to the decision before it, or to unscreened. Only its screener or a curator may, against the
 * version they saw. Undoing an exclusion that withdrew settled records settles exactly those again (a curator's
 * call, one registry change), or refuses with 409 when that is no longer safe.
 */
export async function undoLast(db: Knex, refId: number, input: ScreeningUndoInput, actor: { id: number; roles: Role[] }): Promise<ScreeningUndoResult> {
  return db.transaction((trx) => undoIn(trx, refId, input, actor));
}

async function undoIn(trx: Knex.Transaction, refId: number, input: ScreeningUndoInput, actor: { id: number; roles: Role[] }): Promise<ScreeningUndoResult> {
  const r = await lockRef(trx, refId);
  if (!r) throw new NotFoundError(`There is no reference ${refId}.`);
  if (r.merged_into) throw new ConflictError(`Reference ${refId} was merged into reference ${r.merged_into}; it has no decision to undo.`, { mergedInto: r.merged_into });
  if (r.version !== input.version)
    throw new ConflictError(`Reference ${refId} changed since you opened it (now version ${r.version}); reload it before undoing.`, { currentVersion: r.version, screeningStatus: r.screening_status });
  const own = await takeBackOwnVote(trx, r, actor);
  if (own) return own;
  const [last, before] = await decisionsOf(trx, refId);
  if (!last) throw new ConflictError(`Reference ${refId} has no decision to undo.`);
  if (last.decided_by !== actor.id && !hasRole(actor.roles, 'curator'))
    throw new ForbiddenError(`The last decision on reference ${refId} is ${last.login ?? 'someone else'}'s; only they or a curator may undo it.`);
  await reopenVotesOf(trx, refId, last.id, actor);
  const restoredRecords = (last.withdrawn_records ?? []).map(Number);
  if (restoredRecords.length && !hasRole(actor.roles, 'curator'))
    throw new ForbiddenError(`Undoing the exclusion of reference ${refId} settles its withdrawn effects again; only a curator may.`);
  await markUndone(trx, last.id, actor.id);
  const screeningStatus = before ? statusAfter(before.stage, before.decision) : 'unscreened';
  await updateRef(trx, refId, { screening_status: screeningStatus, version: r.version + 1 });
  const registryVersion = restoredRecords.length
    ? await restoreWithdrawnRecordsIn(trx, actor.id, refId, restoredRecords, `Exclusion undone at screening (decision ${last.id})`)
    : null;
  await recordAudit(trx, {
    actorId: actor.id,
    action: 'screening.undo',
    entityType: 'reference',
    entityId: refId,
    details: { undoneDecision: last.id, stage: last.stage, decision: last.decision, reason: last.reason, now: screeningStatus, restoredRecords },
  });
  return { refId, undone: { id: Number(last.id), stage: last.stage, decision: last.decision, reason: last.reason }, screeningStatus, version: r.version + 1, restoredRecords, registryVersion };
}

/** CSL-JSON keeps keywords as one string ("a, b; c") or, from some sources, a list. */
export function cslKeywords(csl: Record<string, unknown> | null | undefined): string[] {
  const raw = csl?.keyword ?? csl?.keywords;
  const parts = Array.isArray(raw) ? raw.filter((k): k is string => typeof k === 'string') : typeof raw === 'string' ? raw.split(/[;,]/) : [];
  return [...new Set(parts.map((k) => k.trim()).filter(Boolean))];
}

/** The next references waiting for a stage (unscreened, or awaiting full text), oldest first, with what a screener reads (abstract, keywords, attachments), why each is here, and how many are left. */
export async function queue(db: Knex, q: { limit: number; batch?: number; stage: ScreeningStage }, actor: Actor): Promise<ScreeningQueue> {
  const dual = (await screeningRule(db)).screeners === 2;
  // Two screeners: each sees what they have not decided yet; a curator also sees disagreements to settle.
  const only = dual ? awaitingScreener(db, q.stage, actor.id, isCurator(actor)) : undefined;
  const { total, rows } = await refsAwaiting(db, { ...q, status: WAITING_AT[q.stage], only });
  const ids = rows.map((r) => r.id);
  const [batches, attachments, votes] = await Promise.all([creatingBatchesOf(db, ids), attachmentsOfRefs(db, ids), dual ? openVoteSummary(db, ids, q.stage, actor.id) : new Map<number, { n: number }>()]);
  const why = (id: number) => {
    const n = votes.get(id)?.n ?? 0;
    if (n >= 2) return 'conflict' as const;
    if (n === 1) return 'second_screener_needed' as const;
    return q.stage === 'title_abstract' ? ('new' as const) : ('passed_title_abstract' as const);
  };
  return {
    stage: q.stage,
    items: rows.map((r) => ({
      ...summary(r),
      abstract: typeof r.csl?.abstract === 'string' ? r.csl.abstract : null,
      version: r.version,
      keywords: cslKeywords(r.csl),
      attachments: attachments.filter((a) => a.ref_id === r.id).map((a) => ({ id: a.id, filename: a.filename, sizeBytes: a.size_bytes, mime: a.mime })),
      why: { kind: why(r.id), batch: batches.get(r.id) ?? null },
    })),
    remaining: total,
  };
}

/**
 * PRISMA 2020 flow numbers, computed from the data each time. Identified: every record that came in (each
 * reference by its source, plus each import entry found to be a duplicate, by its batch's format).
 * Duplicates removed: those duplicate entries plus merged references. Screened: the rest that have a decision.
 */
export async function prismaCounts(db: Db): Promise<PrismaFlow> {
  const [refs, dupEntries, reasons] = await Promise.all([refCounts(db), duplicateEntriesByFormat(db), exclusionReasonCounts(db)]);
  const identified: Record<string, number> = {};
  for (const r of [...refs.bySource, ...dupEntries]) identified[r.source] = (identified[r.source] ?? 0) + r.n;
  const duplicateEntries = dupEntries.reduce((s, r) => s + r.n, 0);
  const st: Record<ScreeningStatus, number> = { unscreened: 0, awaiting_full_text: 0, included: 0, excluded: 0 };
  for (const s of refs.byStatus) st[s.status] = s.n;
  const byStage = Object.fromEntries(SCREENING_STAGES.map((g) => [g, Object.fromEntries(STAGE_REASONS[g].map((r) => [r, 0]))])) as Record<ScreeningStage, Record<string, number>>;
  const excludedByReason = Object.fromEntries(EXCLUSION_REASONS.map((r) => [r, 0])) as Record<string, number>;
  for (const r of reasons) {
    const key = r.reason ?? NO_REASON;
    byStage[r.stage][key] = (byStage[r.stage][key] ?? 0) + r.n;
    excludedByReason[key] = (excludedByReason[key] ?? 0) + r.n;
  }
  const sum = (o: Record<string, number>) => Object.values(o).reduce((s, n) => s + n, 0);
  const identifiedTotal = sum(identified);
  const removed = refs.merged + duplicateEntries;
  const ftExcluded = sum(byStage.full_text);
  const taExcluded = st.excluded - ftExcluded;
  const reachedFullText = st.awaiting_full_text + st.included + ftExcluded;
  return {
    stages: {
      title_abstract: { decided: reachedFullText + taExcluded, waiting: st.unscreened, included: reachedFullText, excluded: taExcluded, excludedByReason: byStage.title_abstract},
      full_text: { decided: st.included + ftExcluded, waiting: st.awaiting_full_text, included: st.included, excluded: ftExcluded, excludedByReason: byStage.full_text},
    },
    identified: { total: identifiedTotal, bySource: identified },
    duplicatesRemoved: { total: removed, importDuplicates: duplicateEntries, merged: refs.merged },
    afterDuplicates: identifiedTotal - removed,
    screened: st.included + st.excluded,
    awaitingScreening: st.unscreened + st.awaiting_full_text,
    excluded: { total: st.excluded, byReason: excludedByReason },
    included: st.included,
  };
}
