import type { Db } from './db.js';
import type { ScreeningDecisionRow } from './rows.js';

export async function insertDecision(db: Db, d: Pick<ScreeningDecisionRow, 'ref_id' | 'stage' | 'decision' | 'reason' | 'note' | 'decided_by' | 'withdrawn_records'>): Promise<Pick<ScreeningDecisionRow, 'id' | 'decided_at'>> {
  const [row] = await db('screening_decisions').insert({ ...d, withdrawn_records: JSON.stringify(d.withdrawn_records) }).returning(['id', 'decided_at']);
  return row;
}

/** Every decision on a reference that still counts (not undone), newest first, with who made it. */
export async function decisionsOf(db: Db, refId: number): Promise<(ScreeningDecisionRow & { login: string | null })[]> {
  return db('screening_decisions')
    .leftJoin('users', 'users.id', 'screening_decisions.decided_by')
    .where('ref_id', refId)
    .whereNull('screening_decisions.undone_at')
    .orderBy([{ column: 'decided_at', order: 'desc' }, { column: 'screening_decisions.id', order: 'desc' }])
    .select('screening_decisions.*', 'users.login');
}

export async function latestDecision(db: Db, refId: number): Promise<Pick<ScreeningDecisionRow, 'decision' | 'stage'> | undefined> {
  return db<ScreeningDecisionRow>('screening_decisions')
    .where({ ref_id: refId })
    .whereNull('undone_at')
    .orderBy([{ column: 'decided_at', order: 'desc' }, { column: 'id', order: 'desc' }])
    .first('decision', 'stage');
}

/** Excluded live references by the stage and reason of their latest decision (a reason may be null at title/abstract). */
export async function exclusionReasonCounts(db: Db): Promise<{ stage: ScreeningDecisionRow['stage']; reason: string | null; n: number }[]> {
  const rows: { stage: ScreeningDecisionRow['stage']; reason: string | null; n: number }[] = await db
    .from(
      db('screening_decisions as d')
        .join('refs as r', 'r.id', 'd.ref_id')
        .whereNull('r.merged_into')
        .whereNull('d.undone_at')
        .where('r.screening_status', 'excluded')
        .distinctOn('d.ref_id')
        .orderBy([{ column: 'd.ref_id' }, { column: 'd.decided_at', order: 'desc' }, { column: 'd.id', order: 'desc' }])
        .select('d.ref_id', 'd.stage', 'd.reason')
        .as('latest'),
    )
    .groupBy('stage', 'reason')
    .select('stage', 'reason')
    .count({ n: '*' });
  return rows.map((r) => ({ stage: r.stage, reason: r.reason, n: Number(r.n) }));
}

/** Marks a decision undone (it stays in the table; audit_log says who undid it and when). */
export async function markUndone(db: Db, id: number, by: number): Promise<void> {
  await db<ScreeningDecisionRow>('screening_decisions').where({ id }).update({ undone_at: new Date(), undone_by: by });
}
