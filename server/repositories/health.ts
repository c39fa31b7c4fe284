import type { Db } from './db.js';

/** One round trip to the database. */
export async function ping(db: Db): Promise<void> {
  await db.raw('select 1');
}
