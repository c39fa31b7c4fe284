import type { Knex } from 'knex';
import type { ScreeningDecisionInput } from '../../shared/schemas/references.js';
import { EXCLUSION_REASONS } from '../../shared/vocabulary/screening.js';
import { ConflictError, NotFoundError } from '../lib/errors.js';
import { recordAudit } from './audit.js';
import { summary } from './references.js';

/** Records a decision (the history keeps every one; the reference shows the latest). */
export async function decide(db: Knex, refId: number, input: ScreeningDecisionInput, actorId: number) {
  return db.transaction(async (trx) => {
    const r = await trx('refs').where({ id: refId }).forUpdate().first('id', 'merged_into', 'screening_status', 'version');
    if (!r) throw new NotFoundError(`There is no reference ${refId}.`);
    if (r.merged_into) throw new ConflictError(`Reference ${refId} was merged into reference ${r.merged_into}; screen that one.`, { mergedInto: r.merged_into });
    const [row] = await trx('screening_decisions')
      .insert({ ref_id: refId, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decided_by: actorId })
      .returning(['id', 'decided_at']);
    await trx('refs').where({ id: refId }).update({ screening_status: input.decision, version: r.version + 1, updated_at: trx.fn.now() });
    await recordAudit(trx, {
      actorId,
      action: 'screening.decide',
      entityType: 'reference',
      entityId: refId,
      details: { decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, previous: r.screening_status },
    });
    return { id: row.id, refId, decision: input.decision, reason: input.reason ?? null, note: input.note ?? null, decidedAt: new Date(row.decided_at).toISOString(), screeningStatus: input.decision };
  });
}

/** The next unscreened references, oldest first, and how many are left. */
export async function queue(db: Knex, q: { limit: number; batch?: number }) {
  const base = db('refs')
    .whereNull('merged_into')
    .where('screening_status', 'unscreened')
    .modify((qb) => {
      if (q.batch) qb.whereIn('id', db('import_entries').where({ batch_id: q.batch }).whereNotNull('reference_id').select('reference_id'));
    });
  const [{ count }] = await base.clone().count<{ count: number }[]>({ count: '*' });
  const rows = await base.clone().orderBy([{ column: 'created_at' }, { column: 'id' }]).limit(q.limit).select('*');
  return {
    items: rows.map((r: Record<string, any>) => ({ ...summary(r), abstract: typeof r.csl?.abstract === 'string' ? r.csl.abstract : null, version: r.version })),
    remaining: Number(count),
  };
}

/**
 * PRISMA 2020 flow numbers, computed from the data each time. Identified: every record that came in (each
 * reference by its source, plus each import entry found to be a duplicate, by its batch's format).
 * Duplicates removed: those duplicate entries plus merged references. Screened: the rest that have a decision.
 */
export async function prismaCounts(db: Knex) {
  const bySource = await db('refs').groupBy('source').select('source').count({ n: '*' });
  const dupEntries = await db('import_entries').join('import_batches', 'import_batches.id', 'import_entries.batch_id').where('import_entries.status', 'duplicate').groupBy('import_batches.format').select('import_batches.format as source').count({ n: '*' });
  const identified: Record<string, number> = {};
  for (const r of [...bySource, ...dupEntries] as Array<{ source: string; n: number }>) identified[r.source] = (identified[r.source] ?? 0) + Number(r.n);
  const [{ merged }] = await db('refs').whereNotNull('merged_into').count<{ merged: number }[]>({ merged: '*' });
  const duplicateEntries = (dupEntries as Array<{ n: number }>).reduce((s, r) => s + Number(r.n), 0);
  const statuses = await db('refs').whereNull('merged_into').groupBy('screening_status').select('screening_status').count({ n: '*' });
  const st: Record<string, number> = { unscreened: 0, included: 0, excluded: 0 };
  for (const s of statuses as Array<{ screening_status: string; n: number }>) st[s.screening_status] = Number(s.n);
  // The reason of each excluded reference is that of its latest decision.
  const reasons = await db
    .from(
      db('screening_decisions as d')
        .join('refs as r', 'r.id', 'd.ref_id')
        .whereNull('r.merged_into')
        .where('r.screening_status', 'excluded')
        .distinctOn('d.ref_id')
        .orderBy([{ column: 'd.ref_id' }, { column: 'd.decided_at', order: 'desc' }, { column: 'd.id', order: 'desc' }])
        .select('d.ref_id', 'd.reason')
        .as('latest'),
    )
    .groupBy('reason')
    .select('reason')
    .count({ n: '*' });
  const excludedByReason = Object.fromEntries(EXCLUSION_REASONS.map((r) => [r, 0])) as Record<string, number>;
  for (const r of reasons as Array<{ reason: string; n: number }>) excludedByReason[r.reason] = Number(r.n);
  const identifiedTotal = Object.values(identified).reduce((s, n) => s + n, 0);
  const removed = Number(merged) + duplicateEntries;
  return {
    identified: { total: identifiedTotal, bySource: identified },
    duplicatesRemoved: { total: removed, importDuplicates: duplicateEntries, merged: Number(merged) },
    afterDuplicates: identifiedTotal - removed,
    screened: st.included + st.excluded,
    awaitingScreening: st.unscreened,
    excluded: { total: st.excluded, byReason: excludedByReason },
    included: st.included,
  };
}
