import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { SnapshotRow, UserRow } from './rows.js';

export type NewSnapshot = Omit<SnapshotRow, 'created_at' | 'request' | 'effects' | 'output' | 'references' | 'prisma' | 'flow'> & {
  request: unknown;
  effects: unknown;
  output: unknown;
  references: unknown;
  prisma: unknown;
  flow: unknown;
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
    flow: s.flow == null ? null : JSON.stringify(s.flow),
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

/** What a snapshot's feed and re-check need without its whole output: the request and its headline result. */
export interface SnapshotHead {
  id: string;
  title: string;
  registry_version: string | number;
  request: unknown;
  result: unknown;
  created_at: Date;
}

export async function findSnapshotHead(db: Db, id: string): Promise<SnapshotHead | undefined> {
  return db('snapshots').where({ id }).first('id', 'title', 'registry_version', 'request', 'created_at', db.raw(`output->'result' AS result`));
}

/** The snapshot's frozen effects and pooled rows (their weights). */
export async function snapshotEffectsAndRows(db: Db, id: string): Promise<{ effects: unknown; rows: unknown }> {
  return db('snapshots').where({ id }).first('effects', db.raw(`output->'rows' AS rows`));
}

/** Snapshots not yet checked against this registry version, with what each last saw (null: never checked). */
export async function snapshotsBehind(db: Db, version: number): Promise<Array<SnapshotHead & { fingerprint: string | null }>> {
  return db('snapshots as s')
    .leftJoin('snapshot_watch as w', 'w.snapshot_id', 's.id')
    .where((q) => q.whereNull('w.last_version').orWhere('w.last_version', '<', version))
    .orderBy('s.created_at')
    .select('s.id', 's.title', 's.registry_version', 's.request', 's.created_at', db.raw(`s.output->'result' AS result`), 'w.fingerprint');
}

export async function markSnapshotChecked(db: Db, id: string, fingerprint: string, version: number): Promise<void> {
  await db('snapshot_watch').insert({ snapshot_id: id, fingerprint, last_version: version }).onConflict('snapshot_id').merge();
}

export interface SnapshotChangeRow {
  id: number;
  snapshot_id: string;
  at: Date;
  registry_version: string | number;
  result: unknown;
  changes: unknown;
  events: unknown;
}

export async function insertSnapshotChange(db: Db, c: Pick<SnapshotChangeRow, 'snapshot_id' | 'registry_version' | 'result' | 'changes' | 'events'>): Promise<void> {
  await db('snapshot_changes').insert({ ...c, result: JSON.stringify(c.result), changes: JSON.stringify(c.changes), events: JSON.stringify(c.events) });
}

export const listSnapshotChanges = (db: Db, id: string): Promise<SnapshotChangeRow[]> => db('snapshot_changes').where({ snapshot_id: id }).orderBy('id', 'desc').limit(50);
