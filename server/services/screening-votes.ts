import type { Knex } from 'knex';
import { screeningAgreement } from '../../shared/agreement/screening-agreement.js';
import { hasRole } from '../../shared/roles.js';
import type { ScreeningDecisionInput, ScreeningResult, ScreeningUndoResult } from '../../shared/schemas/references.js';
import type { ScreeningAgreementCounts, ScreeningConflicts, ScreeningRule, ScreeningSettleInput } from '../../shared/schemas/screening.js';
import { EXCLUSION_REASON_LABELS, SCREENING_STAGES, statusAfter, type ExclusionReason, type ScreeningStage } from '../../shared/vocabulary/screening.js';
import { ConflictError, ForbiddenError, NotFoundError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import { iso, type Db } from '../repositories/db.js';
import { lockRef, refsByIds, updateRef } from '../repositories/refs.js';
import type { RefRow } from '../repositories/rows.js';
import { insertDecision } from '../repositories/screening.js';
import {
  conflictCounts, conflictRefIds, insertVote, openVotes, openVotesOfRefs, screeningRule, setScreeningRule, settledVotePairs, settleVotes, votesSettledBy, withdrawVotes,
} from '../repositories/screening-votes.js';
import type { Actor } from './coding.js';
import { summary } from './references.js';
import { checkReason, STAGE_WORD, WAITING_AT } from './screening-words.js';

export const isCurator = (actor: Actor) => hasRole(actor.roles, 'curator');

const ruleAnswer = (r: Awaited<ReturnType<typeof screeningRule>>): ScreeningRule => ({
  screeners: r.screeners,
  updatedAt: r.updated_at ? iso(r.updated_at) : null,
  updatedBy: r.updated_by && r.login ? { id: r.updated_by, login: r.login } : null,
});

export async function getRule(db: Db): Promise<ScreeningRule> {
  return ruleAnswer(await screeningRule(db));
}

/** A curator sets how many screeners decide each record; audited with the rule before. */
export async function setRule(db: Knex, screeners: 1 | 2, actor: Actor): Promise<ScreeningRule> {
  return db.transaction(async (trx) => {
    const before = await trx('screening_rule').where({ id: 1 }).forUpdate().first('screeners');
    await setScreeningRule(trx, screeners, actor.id);
    await recordAudit(trx, { actorId: actor.id, action: 'screening.rule', entityType: 'screening_rule', entityId: 1, details: { screeners, previous: before?.screeners ?? 1 } });
    return ruleAnswer(await screeningRule(trx));
  });
}

/** Two votes settle a record by themselves when they name the same decision and the same reason. */
const category = (v: { decision: string; reason: string | null }) => `${v.decision}${v.reason ? `:${v.reason}` : ''}`;

/**
 * A screener's blind decision under the two-screener rule. The first is kept aside (the reference does not change,
 * so nothing anyone reads shows it); the second settles the record when it agrees, or leaves both for a curator.
 * The audit entry of a vote says only that one was cast, not what it was.
 */
export async function recordVoteIn(trx: Knex.Transaction, r: RefRow, stage: ScreeningStage, input: ScreeningDecisionInput, actor: Actor): Promise<ScreeningResult> {
  const votes = await openVotes(trx, r.id, stage);
  if (votes.some((v) => v.decided_by === actor.id))
    throw new ConflictError(`You have already decided reference ${r.id} at the ${STAGE_WORD[stage]} stage; it needs another screener's decision, not a second one of yours.`, {
      currentVersion: r.version,
      screeningStatus: r.screening_status,
    });
  if (votes.length >= 2)
    throw new ConflictError(`Reference ${r.id} has both screeners' decisions at the ${STAGE_WORD[stage]} stage and waits for a curator to settle it.`, {
      currentVersion: r.version,
      screeningStatus: r.screening_status,
    });
  const vote = await insertVote(trx, { ref_id: r.id, stage, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decided_by: actor.id });
  await recordAudit(trx, { actorId: actor.id, action: 'screening.vote', entityType: 'reference', entityId: r.id, details: { stage, vote: vote.id, decisionsIn: votes.length + 1 } });
  const pending = {
    id: vote.id, refId: r.id, stage, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decidedAt: iso(vote.decided_at),
    screeningStatus: r.screening_status, version: r.version, withdrawnRecords: [], registryVersion: null,
  };
  const first = votes[0];
  if (!first || category(first) !== category(vote)) return { ...pending, dual: { decisionsIn: votes.length + 1, settled: false } };
  const settled = await settleIn(trx, r, stage, { decision: vote.decision, reason: vote.reason, note: input.note ?? null }, actor.id, [first.id, vote.id], 'agreed');
  return { ...pending, id: settled.id, decidedAt: settled.decidedAt, screeningStatus: settled.screeningStatus, version: settled.version, dual: { decisionsIn: 2, settled: true } };
}

/** Writes the settled decision of two votes (agreed, or a curator's settlement) and marks them settled by it. */
async function settleIn(
  trx: Knex.Transaction, r: RefRow, stage: ScreeningStage, d: { decision: 'included' | 'excluded'; reason: string | null; note: string | null }, by: number, voteIds: number[],
  how: 'agreed' | 'curator',
) {
  const row = await insertDecision(trx, { ref_id: r.id, stage, decision: d.decision, reason: d.reason, note: d.note, decided_by: by, withdrawn_records: [] });
  await settleVotes(trx, voteIds, row.id);
  const screeningStatus = statusAfter(stage, d.decision);
  await updateRef(trx, r.id, { screening_status: screeningStatus, version: r.version + 1 });
  await recordAudit(trx, {
    actorId: by,
    action: how === 'agreed' ? 'screening.decide' : 'screening.settle',
    entityType: 'reference',
    entityId: r.id,
    details: { stage, decision: d.decision, reason: d.reason, note: d.note, previous: r.screening_status, settledFrom: how, votes: voteIds, withdrawnRecords: [] },
  });
  return { id: row.id, decidedAt: iso(row.decided_at), screeningStatus, version: r.version + 1 };
}

/** Under either rule, a screener's open vote is theirs to take back (the record waits for it again). */
export async function takeBackOwnVote(trx: Knex.Transaction, r: RefRow, actor: Actor): Promise<ScreeningUndoResult | null> {
  const stage = SCREENING_STAGES.find((s) => WAITING_AT[s] === r.screening_status);
  if (!stage) return null;
  const mine = (await openVotes(trx, r.id, stage)).find((v) => v.decided_by === actor.id);
  if (!mine) return null;
  await withdrawVotes(trx, [mine.id]);
  await recordAudit(trx, { actorId: actor.id, action: 'screening.undo', entityType: 'reference', entityId: r.id, details: { stage, undoneVote: mine.id } });
  return { refId: r.id, undone: { id: mine.id, stage, decision: mine.decision, reason: mine.reason }, screeningStatus: r.screening_status, version: r.version, restoredRecords: [], registryVersion: null };
}

/** Undoing a decision two screeners' votes settled reopens the record for two fresh decisions (a curator's call). */
export async function reopenVotesOf(trx: Knex.Transaction, refId: number, decisionId: number, actor: Actor): Promise<void> {
  const votes = await votesSettledBy(trx, decisionId);
  if (!votes.length) return;
  if (!isCurator(actor)) throw new ForbiddenError(`The decision on reference ${refId} was settled by two screeners; only a curator may undo it.`);
  await withdrawVotes(trx, votes.map((v) => v.id));
}

/** A decision under the one-screener rule replaces open votes left from the two-screener rule. */
export async function supersedeOpenVotes(trx: Knex.Transaction, refId: number, stage: ScreeningStage): Promise<void> {
  await withdrawVotes(trx, (await openVotes(trx, refId, stage)).map((v) => v.id));
}

/** The curator's disagreement queue at a stage: both votes in words, without those the curator cast one of. */
export async function conflicts(db: Db, q: { stage: ScreeningStage; limit: number }, actor: Actor): Promise<ScreeningConflicts> {
  const { ids, total, ownVotes } = await conflictRefIds(db, q.stage, WAITING_AT[q.stage], actor.id, q.limit);
  const [refs, votes] = await Promise.all([refsByIds(db, ids), openVotesOfRefs(db, ids, q.stage)]);
  const byId = new Map(refs.map((r) => [r.id, r]));
  return {
    stage: q.stage,
    total,
    ownVotes,
    items: ids.flatMap((id) => {
      const r = byId.get(id);
      if (!r) return [];
      return [{
        ...summary(r),
        version: r.version,
        abstract: typeof r.csl?.abstract === 'string' ? r.csl.abstract : null,
        votes: votes.filter((v) => v.ref_id === id).map((v) => ({
          id: v.id, screener: v.login ? { id: v.decided_by, login: v.login } : null, decision: v.decision, reason: v.reason, note: v.note, decidedAt: iso(v.decided_at),
        })),
      }];
    }),
  };
}

/**
 * A curator settles a disagreement: picks the outcome with why, against the version they saw, in one transaction.
 * Neither of the two screeners may settle their own disagreement.
 */
export async function settle(db: Knex, refId: number, input: ScreeningSettleInput, actor: Actor): Promise<ScreeningResult> {
  return db.transaction(async (trx) => {
    const r = await lockRef(trx, refId);
    if (!r) throw new NotFoundError(`There is no reference ${refId}.`);
    if (r.merged_into) throw new ConflictError(`Reference ${refId} was merged into reference ${r.merged_into}; settle that one.`, { mergedInto: r.merged_into });
    if (r.version !== input.version)
      throw new ConflictError(`Reference ${refId} changed since you opened it (now version ${r.version}); reload the disagreement queue.`, { currentVersion: r.version, screeningStatus: r.screening_status });
    const votes = r.screening_status === WAITING_AT[input.stage] ? await openVotes(trx, refId, input.stage) : [];
    if (votes.length < 2 || category(votes[0]) === category(votes[1]))
      throw new ConflictError(`Reference ${refId} has no disagreement to settle at the ${STAGE_WORD[input.stage]} stage.`, { currentVersion: r.version, screeningStatus: r.screening_status });
    if (votes.some((v) => v.decided_by === actor.id))
      throw new ForbiddenError(`You screened reference ${refId} yourself; another curator settles this disagreement.`);
    checkReason(refId, input.stage, input);
    const why = input.reason ? `${EXCLUSION_REASON_LABELS[input.reason as ExclusionReason]}. ` : '';
    const done = await settleIn(trx, r, input.stage, { decision: input.decision, reason: input.reason ?? null, note: `Settled by a curator: ${why}${input.rationale}` }, actor.id, votes.map((v) => v.id), 'curator');
    return {
      id: done.id, refId, stage: input.stage, decision: input.decision, reason: input.reason ?? null, note: `Settled by a curator: ${why}${input.rationale}`, decidedAt: done.decidedAt,
      screeningStatus: done.screeningStatus, version: done.version, withdrawnRecords: [], registryVersion: null, dual: { decisionsIn: 2, settled: true },
    };
  });
}

/** % agreement and Cohen's κ of the two screeners over settled pairs, per stage (categories: included, excluded for each reason), and open disagreements. */
export async function agreementCounts(db: Db): Promise<ScreeningAgreementCounts> {
  const [rule, pairs, open] = await Promise.all([screeningRule(db), settledVotePairs(db), conflictCounts(db)]);
  const of = (stage: ScreeningStage) => ({
    ...screeningAgreement(pairs.filter((p) => p.stage === stage).map((p) => [p.categories[0], p.categories[1]] as const)),
    conflicts: open[stage],
  });
  return { screeners: rule.screeners, stages: { title_abstract: of('title_abstract'), full_text: of('full_text') } };
}
