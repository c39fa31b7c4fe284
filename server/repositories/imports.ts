import type { Knex } from 'knex';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { EntryStatus, ImportBatchRow, ImportEntryRow } from './rows.js';

export type EntryCounts = Record<EntryStatus, number>;
export type BatchWithLogin = Omit<ImportBatchRow, 'source_text'> & { login: string | null };

/** Every column but the stored text (up to 20 MB), which only the import job reads. */
const BATCH_COLUMNS = ['id', 'format', 'label', 'state', 'total', 'created_by', 'created_at', 'finished_at', 'processed', 'failure'].map((c) => `import_batches.${c}`);

export const emptyCounts = (): EntryCounts => ({ imported: 0, duplicate: 0, rejected: 0, pending: 0 });

export function countStatuses(rows: Array<Pick<ImportEntryRow, 'status'>>): EntryCounts {
  const c = emptyCounts();
  for (const r of rows) c[r.status]++;
  return c;
}

export async function insertBatch(db: Db, b: Pick<ImportBatchRow, 'format' | 'label' | 'total' | 'created_by'> & Partial<Pick<ImportBatchRow, 'state' | 'source_text' | 'processed'>>): Promise<number> {
  const [row] = await db<ImportBatchRow>('import_batches').insert(b).returning('id');
  return row.id;
}

export async function markBatchDone(db: Db, id: number): Promise<void> {
  await db('import_batches').where({ id }).update({ state: 'done', finished_at: db.fn.now() });
}

/** Marks a running batch done when no entry is pending; returns it when this call finished it. */
export async function finishBatchIfDone(trx: Knex.Transaction, id: number): Promise<Pick<ImportBatchRow, 'id' | 'created_by'> | undefined> {
  const [row] = await trx('import_batches')
    .where({ id, state: 'running' })
    .whereNotExists(trx('import_entries').where({ batch_id: id, status: 'pending' }).select(trx.raw('1')))
    .update({ state: 'done', finished_at: trx.fn.now() })
    .returning(['id', 'created_by']);
  return row;
}

export async function findBatch(db: Db, id: number): Promise<BatchWithLogin | undefined> {
  return db('import_batches').leftJoin('users', 'users.id', 'import_batches.created_by').where('import_batches.id', id).first(...BATCH_COLUMNS, 'users.login');
}

/** A job's batch with its stored text, locked for the job's first step. */
export async function lockJobBatch(trx: Knex.Transaction, id: number): Promise<ImportBatchRow | undefined> {
  return trx<ImportBatchRow>('import_batches').where({ id }).forUpdate().first();
}

export async function updateJobBatch(db: Db, id: number, update: Partial<Pick<ImportBatchRow, 'state' | 'total' | 'processed' | 'failure' | 'source_text'>> & { finished?: boolean }): Promise<void> {
  const { finished, ...cols } = update;
  await db('import_batches').where({ id }).update({ ...cols, ...(finished ? { finished_at: db.fn.now() } : {}) });
}

export async function insertEntries(db: Db, rows: ImportEntryRow[]): Promise<void> {
  for (let i = 0; i < rows.length; i += 1000) await db('import_entries').insert(rows.slice(i, i + 1000));
}

export async function entryCounts(db: Db, batchId: number): Promise<EntryCounts> {
  return countStatuses(await db<ImportEntryRow>('import_entries').where({ batch_id: batchId }).select('status'));
}

/** How many entries of a batch are pending with a message holding `phrase` (their last look-up found the resolver away). */
export async function pendingSaying(db: Db, batchId: number, phrase: string): Promise<number> {
  return countRows(db<ImportEntryRow>('import_entries').where({ batch_id: batchId, status: 'pending' }).whereLike('message', `%${phrase}%`));
}

/** Entries of a batch in file order: all of them, or one page (optionally of one status), and how many match. */
export async function batchEntries(db: Db, batchId: number, paging?: PageRequest & { status?: EntryStatus }) {
  const filtered = db<ImportEntryRow>('import_entries').where({ batch_id: batchId }).modify((qb) => (paging?.status ? qb.where('status', paging.status) : qb));
  const total = await countRows(filtered);
  const ordered = filtered.clone().orderBy('idx');
  const rows: ImportEntryRow[] = paging ? await pageOf(ordered, paging) : await ordered;
  return { total, rows };
}

export async function entryReferenceIds(db: Db, batchId: number, status: EntryStatus): Promise<number[]> {
  const ids: (number | null)[] = await db<ImportEntryRow>('import_entries').where({ batch_id: batchId, status }).pluck('reference_id');
  return ids.filter((id): id is number => id != null);
}

export async function pendingEntries(db: Db, batchId: number, indexes?: number[]): Promise<ImportEntryRow[]> {
  return db<ImportEntryRow>('import_entries')
    .where({ batch_id: batchId, status: 'pending' })
    .modify((q) => (indexes ? q.whereIn('idx', indexes) : q))
    .orderBy('idx');
}

/** Settles one pending entry (only if it is still pending, so a job run twice changes nothing). */
export async function settleEntry(db: Db, batchId: number, idx: number, update: Partial<ImportEntryRow>): Promise<void> {
  await db('import_entries').where({ batch_id: batchId, idx, status: 'pending' }).update({ ...update, updated_at: db.fn.now() });
}

export async function listBatches(db: Db, q: PageRequest & { sort: 'created_at' | 'format' | 'total'; order: 'asc' | 'desc' }) {
  const total = await countRows(db('import_batches'));
  const rows: BatchWithLogin[] = await pageOf(
    db('import_batches')
      .leftJoin('users', 'users.id', 'import_batches.created_by')
      .select(...BATCH_COLUMNS, 'users.login')
      .orderBy(`import_batches.${q.sort}`, q.order)
      .orderBy('import_batches.id', 'desc'),
    q,
  );
  const ids = rows.map((r) => r.id);
  const counts: Array<{ batch_id: number; status: EntryStatus; n: number }> = ids.length
    ? await db('import_entries').whereIn('batch_id', ids).groupBy('batch_id', 'status').select('batch_id', 'status').count({ n: '*' })
    : [];
  const countsOf = (id: number) => {
    const c = emptyCounts();
    for (const x of counts) if (x.batch_id === id) c[x.status] = Number(x.n);
    return c;
  };
  return { total, rows: rows.map((r) => ({ row: r, counts: countsOf(r.id) })) };
}

/** The import history of one reference. */
export async function importsOfRef(db: Db, refId: number): Promise<Array<{ batch_id: number; format: string; idx: number; status: EntryStatus; created_at: Date | string }>> {
  return db('import_entries')
    .join('import_batches', 'import_batches.id', 'import_entries.batch_id')
    .where('reference_id', refId)
    .orderBy('import_batches.id')
    .select('import_batches.id as batch_id', 'import_batches.format', 'import_entries.idx', 'import_entries.status', 'import_batches.created_at');
}

/** The batch that created each of these references (its imported entry); references not created by an import are absent. */
export async function creatingBatchesOf(db: Db, refIds: number[]): Promise<Map<number, number>> {
  if (!refIds.length) return new Map();
  const rows: { reference_id: number; batch_id: number }[] = await db('import_entries')
    .where('status', 'imported')
    .whereIn('reference_id', refIds)
    .groupBy('reference_id')
    .select('reference_id')
    .min({ batch_id: 'batch_id' });
  return new Map(rows.map((r) => [Number(r.reference_id), Number(r.batch_id)]));
}

/** Import entries found to duplicate a record, by their batch's format (PRISMA "records identified"). */
export async function duplicateEntriesByFormat(db: Db): Promise<{ source: string; n: number }[]> {
  const rows: { source: string; n: number }[] = await db('import_entries')
    .join('import_batches', 'import_batches.id', 'import_entries.batch_id')
    .where('import_entries.status', 'duplicate')
    .groupBy('import_batches.format')
    .select('import_batches.format as source')
    .count({ n: '*' });
  return rows.map((r) => ({ source: r.source, n: Number(r.n) }));
}
