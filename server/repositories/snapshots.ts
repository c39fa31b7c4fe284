import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { SnapshotRow, UserRow } from './rows.js';

export type NewSnapshot = Omit<SnapshotRow, 'created_at' | 'request' | 'effects' | 'output' | 'references' | 'prisma'> & {
  request: unknown;
  effects: unknown;
  output: unknown;
  references: unknown;
  prisma: unknown;
};

/** Stores a snapshot (the table refuses any later change). */
export async function insertSnapshot(db: Db, s: NewSnapshot): Promise<void> {
  await db('snapshots').insert({
    ...s,
    request: JSON.stringify(s.request),
    effects: JSON.stringify(s.effects),
    output: JSON.stringify(s.output),
    references: JSON.stringify(s.references),
    prisma: s.prisma == null ? null : JSON.stringify(s.prisma),
  });
}

/**
 * The lock on saving one request (jsonb's text is canonical), held to the end of the transaction: `wait` blocks
 * until it is free, otherwise answers false at once when another transaction holds it.
 */
export async function lockSnapshotRequest(db: Db, request: unknown, wait: boolean): Promise<boolean> {
  const fn = wait ? 'pg_advisory_xact_lock' : 'pg_try_advisory_xact_lock';
  const r = await db.raw(`SELECT ${fn}(hashtext('snapshot:' || ?::jsonb::text)) AS got`, [JSON.stringify(request)]);
  return wait || r.rows[0].got === true;
}

/** Snapshots of exactly this request at this registry version (jsonb equality ignores key order). */
export async function snapshotsOfRequest(db: Db, request: unknown, registryVersion: number): Promise<Array<Pick<SnapshotRow, 'id' | 'title' | 'metric'>>> {
  return db('snapshots').where('registry_version', registryVersion).whereRaw('request = ?::jsonb', [JSON.stringify(request)]).orderBy('created_at').select('id', 'title', 'metric');
}

export async function findSnapshot(db: Db, id: string): Promise<(SnapshotRow & Pick<UserRow, 'login' | 'name'>) | undefined> {
  return db('snapshots').leftJoin('users', 'users.id', 'snapshots.created_by').where('snapshots.id', id).first('snapshots.*', 'users.login', 'users.name');
}

export async function listSnapshots(db: Db, q: PageRequest & { sort: 'created_at' | 'k' | 'estimate' | 'title'; order: 'asc' | 'desc'; createdBy?: number }) {
  const base = db('snapshots').modify((b) => {
    if (q.createdBy !== undefined) b.where('snapshots.created_by', q.createdBy);
  });
  const total = await countRows(base);
  const rows: Array<Pick<SnapshotRow, 'id' | 'title' | 'created_at' | 'metric' | 'k' | 'estimate' | 'registry_version'> & { login: string | null }> = await pageOf(
    base
      .clone()
      .leftJoin('users', 'users.id', 'snapshots.created_by')
      .select('snapshots.id', 'snapshots.title', 'snapshots.created_at', 'snapshots.metric', 'snapshots.k', 'snapshots.estimate', 'snapshots.registry_version', 'users.login')
      .orderBy(`snapshots.${q.sort}`, q.order)
      .orderBy('snapshots.id', 'asc'),
    q,
  );
  return { total, rows };
}
