import { ConflictError } from '../lib/errors.js';
import type { Db } from '../repositories/db.js';
import { loginOf } from '../repositories/users.js';

/** 409 for an edit made against an old version, naming who changed it and when. */
export async function staleEdit(db: Db, what: string, row: { version: number; updated_by?: number | null; updated_at?: Date | string }) {
  const who = await loginOf(db, row.updated_by);
  const when = row.updated_at ? new Date(row.updated_at).toISOString().slice(0, 16).replace('T', ' ') + ' UTC' : 'recently';
  return new ConflictError(`${what} was changed by ${who ?? 'someone else'} at ${when} (now version ${row.version}); reload to see their changes before saving again.`, {
    currentVersion: row.version,
    changedBy: who,
  });
}
