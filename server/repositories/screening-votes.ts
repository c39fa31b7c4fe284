import type { Knex } from 'knex';
import type { Db } from './db.js';
import type { ScreeningRuleRow, ScreeningVoteRow } from './rows.js';

type Stage = ScreeningVoteRow['stage'];

export async function screeningRule(db: Db): Promise<Omit<ScreeningRuleRow, 'updated_at'> & { updated_at: ScreeningRuleRow['updated_at'] | null; login: string | null }> {
  const row = await db('screening_rule').leftJoin('users', 'users.id', 'screening_rule.updated_by').where('screening_rule.id', 1).first('screening_rule.*', 'users.login');
  // No row yet (a fresh or emptied database): the one-screener rule.
  return row ?? { id: 1, screeners: 1, updated_by: null, updated_at: null, login: null };
}

export async function setScreeningRule(db: Db, screeners: 1 | 2, by: number): Promise<void> {
  await db('screening_rule').insert({ id: 1, screeners, updated_by: by, updated_at: db.fn.now() }).onConflict('id').merge();
}

/** The live, unsettled votes of a reference at a stage, oldest first, with who cast them. */
export async function openVotes(db: Db, refId: number, stage: Stage): Promise<(ScreeningVoteRow & { login: string | null })[]> {
  return db('screening_votes as v')
    .leftJoin('users as u', 'u.id', 'v.decided_by')
    .where({ 'v.ref_id': refId, 'v.stage': stage })
    .whereNull('v.withdrawn_at')
    .whereNull('v.settled_by_decision')
    .orderBy([{ column: 'v.decided_at' }, { column: 'v.id' }])
    .select('v.*', 'u.login');
}

export async function insertVote(db: Db, v: Pick<ScreeningVoteRow, 'ref_id' | 'stage' | 'decision' | 'reason' | 'note' | 'decided_by'>): Promise<ScreeningVoteRow> {
  const [row] = await db('screening_votes').insert(v).returning('*');
  return row;
}

export async function settleVotes(db: Db, ids: number[], decisionId: number): Promise<void> {
  if (ids.length) await db('screening_votes').whereIn('id', ids).update({ settled_by_decision: decisionId });
}

export async function withdrawVotes(db: Db, ids: number[]): Promise<void> {
  if (ids.length) await db('screening_votes').whereIn('id', ids).update({ withdrawn_at: db.fn.now() });
}

/** The votes a decision settled (an undo of that decision reopens the record for two fresh decisions). */
export async function votesSettledBy(db: Db, decisionId: number): Promise<ScreeningVoteRow[]> {
  return db<ScreeningVoteRow>('screening_votes').where({ settled_by_decision: decisionId }).whereNull('withdrawn_at').select('*');
}

/** Open (unsettled) vote counts per reference at a stage, and which of them `actor` voted on. */
export async function openVoteSummary(db: Db, refIds: number[], stage: Stage, actor: number): Promise<Map<number, { n: number; mine: boolean }>> {
  const out = new Map<number, { n: number; mine: boolean }>();
  if (!refIds.length) return out;
  const rows: { ref_id: number; decided_by: number }[] = await db('screening_votes')
    .whereIn('ref_id', refIds)
    .where({ stage })
    .whereNull('withdrawn_at')
    .whereNull('settled_by_decision')
    .select('ref_id', 'decided_by');
  for (const r of rows) {
    const s = out.get(r.ref_id) ?? { n: 0, mine: false };
    s.n += 1;
    s.mine ||= r.decided_by === actor;
    out.set(r.ref_id, s);
  }
  return out;
}

/** Restricts a refs query to those `actor` has no open vote on at the stage, and (unless `withConflicts`) fewer than two open votes. */
export function awaitingScreener(db: Db, stage: Stage, actor: number, withConflicts: boolean) {
  const open = () => db('screening_votes').where({ stage }).whereNull('withdrawn_at').whereNull('settled_by_decision');
  return (qb: Knex.QueryBuilder) => {
    qb.whereNotIn('id', open().where({ decided_by: actor }).select('ref_id'));
    if (!withConflicts) qb.whereNotIn('id', open().groupBy('ref_id').havingRaw('count(*) >= 2').select('ref_id'));
  };
}

/** References waiting at a stage with two open votes, none of them `actor`'s (oldest second vote first), and how many have one of theirs. */
export async function conflictRefIds(db: Db, stage: Stage, waiting: string, actor: number, limit: number): Promise<{ ids: number[]; total: number; ownVotes: number }> {
  const pairs = db('screening_votes as v')
    .join('refs as r', 'r.id', 'v.ref_id')
    .whereNull('r.merged_into')
    .where('r.screening_status', waiting)
    .where('v.stage', stage)
    .whereNull('v.withdrawn_at')
    .whereNull('v.settled_by_decision')
    .groupBy('v.ref_id')
    .havingRaw('count(*) >= 2')
    .select('v.ref_id', db.raw('max(v.decided_at) as last_at'), db.raw('bool_or(v.decided_by = ?) as mine', [actor]));
  const rows: { ref_id: number; last_at: Date; mine: boolean }[] = await pairs;
  const theirs = rows.filter((r) => !r.mine).sort((a, b) => +new Date(a.last_at) - +new Date(b.last_at) || a.ref_id - b.ref_id);
  return { ids: theirs.slice(0, limit).map((r) => r.ref_id), total: theirs.length, ownVotes: rows.length - theirs.length };
}

export async function openVotesOfRefs(db: Db, refIds: number[], stage: Stage): Promise<(ScreeningVoteRow & { login: string | null })[]> {
  if (!refIds.length) return [];
  return db('screening_votes as v')
    .leftJoin('users as u', 'u.id', 'v.decided_by')
    .whereIn('v.ref_id', refIds)
    .where('v.stage', stage)
    .whereNull('v.withdrawn_at')
    .whereNull('v.settled_by_decision')
    .orderBy([{ column: 'v.decided_at' }, { column: 'v.id' }])
    .select('v.*', 'u.login');
}

/** Settled pairs of votes per stage (both screeners' categories), for agreement: live references only. */
export async function settledVotePairs(db: Db): Promise<{ stage: Stage; ref_id: number; categories: string[] }[]> {
  const rows: { stage: Stage; ref_id: number; categories: string[] }[] = await db('screening_votes as v')
    .join('refs as r', 'r.id', 'v.ref_id')
    .whereNull('r.merged_into')
    .whereNull('v.withdrawn_at')
    .whereNotNull('v.settled_by_decision')
    .groupBy('v.stage', 'v.ref_id', 'v.settled_by_decision')
    .havingRaw('count(*) = 2')
    .select('v.stage', 'v.ref_id', db.raw(`array_agg(v.decision || coalesce(':' || v.reason, '') ORDER BY v.decided_at, v.id) as categories`));
  return rows;
}

/** Open disagreements per stage (two open votes on a record still waiting at that stage). */
export async function conflictCounts(db: Db): Promise<Record<Stage, number>> {
  const rows: { stage: Stage; n: string | number }[] = await db
    .from(
      db('screening_votes as v')
        .join('refs as r', 'r.id', 'v.ref_id')
        .whereNull('r.merged_into')
        .whereRaw(`r.screening_status = CASE v.stage WHEN 'title_abstract' THEN 'unscreened' ELSE 'awaiting_full_text' END`)
        .whereNull('v.withdrawn_at')
        .whereNull('v.settled_by_decision')
        .groupBy('v.stage', 'v.ref_id')
        .havingRaw('count(*) >= 2')
        .select('v.stage')
        .as('c'),
    )
    .groupBy('stage')
    .select('stage')
    .count({ n: '*' });
  const out: Record<Stage, number> = { title_abstract: 0, full_text: 0 };
  for (const r of rows) out[r.stage] = Number(r.n);
  return out;
}
