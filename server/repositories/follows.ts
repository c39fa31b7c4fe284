import type { Db } from './db.js';

export interface FollowRow {
  id: number;
  user_id: number;
  request: unknown;
  snapshot_id: string | null;
  se_share: number;
  weight_share: number;
  unsubscribe_token: string;
  last_result: unknown;
  last_version: string | number;
  last_mailed_at: Date | null;
  created_at: Date;
}

export interface FollowEventRow {
  id: number;
  follow_id: number;
  at: Date;
  registry_version: string | number;
  before: unknown;
  after: unknown;
  events: unknown;
}

export async function insertFollow(db: Db, f: Pick<FollowRow, 'user_id' | 'request' | 'snapshot_id' | 'se_share' | 'weight_share' | 'unsubscribe_token' | 'last_result' | 'last_version'>): Promise<FollowRow> {
  const [row] = await db('follows')
    .insert({ ...f, request: JSON.stringify(f.request), last_result: JSON.stringify(f.last_result) })
    .returning('*');
  return row;
}

export const findFollow = (db: Db, id: number): Promise<FollowRow | undefined> => db('follows').where({ id }).first();
export const findFollowOf = (db: Db, userId: number, id: number): Promise<FollowRow | undefined> => db('follows').where({ id, user_id: userId }).first();
export const listFollowsOf = (db: Db, userId: number): Promise<FollowRow[]> => db('follows').where({ user_id: userId }).orderBy('id');
export const followsBehind = (db: Db, version: number): Promise<FollowRow[]> => db('follows').where('last_version', '<', version).orderBy('id');
/** Deletes a follow only when it is the user's own; answers how many rows went. */
export const deleteFollowOf = (db: Db, userId: number, id: number): Promise<number> => db('follows').where({ id, user_id: userId }).delete();
export const deleteFollowByToken = (db: Db, token: string): Promise<number> => db('follows').where({ unsubscribe_token: token }).delete();

export async function markFollowChecked(db: Db, id: number, version: number, result?: unknown, mailedAt?: Date): Promise<void> {
  await db('follows')
    .where({ id })
    .update({ last_version: version, ...(result !== undefined ? { last_result: JSON.stringify(result) } : {}), ...(mailedAt ? { last_mailed_at: mailedAt } : {}) });
}

/** Records a feed entry; answers its id. */
export async function insertFollowEvent(db: Db, e: Pick<FollowEventRow, 'follow_id' | 'registry_version' | 'before' | 'after' | 'events'>): Promise<number> {
  const [row] = await db('follow_events').insert({ ...e, before: JSON.stringify(e.before), after: JSON.stringify(e.after), events: JSON.stringify(e.events) }).returning('id');
  return Number(row.id);
}

export const listFollowEvents = (db: Db, followId: number): Promise<FollowEventRow[]> => db('follow_events').where({ follow_id: followId }).orderBy('id', 'desc').limit(50);
