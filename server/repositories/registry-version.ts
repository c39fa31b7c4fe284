import type { Knex } from 'knex';
import type { Db } from './db.js';

/**
 * The registry version: max(id) of registry_changes, which grows in the same transaction as every write settled
 * data or its filters can see (settle, reopen, withdraw, an effect's edit, a reference's bibliographic edit or
 * merge, a vocabulary change). bumpRegistry is the one writer and readRegistryVersion the one reader.
 */
export interface RegistryVersion {
  version: number;
  /**
   * The version with the time of its change: a test database truncated and refilled to the same id is not
   * mistaken for the old one. Caches key on this.
   */
  stamp: string;
}

export async function readRegistryVersion(db: Db): Promise<RegistryVersion> {
  const row: { id: string | number; at: Date | string } | undefined = await db('registry_changes').orderBy('id', 'desc').first('id', 'at');
  if (!row) return { version: 0, stamp: '0' };
  const version = Number(row.id);
  return { version, stamp: `${version}@${new Date(row.at).getTime()}` };
}

/** The version number alone (answers and snapshots state it). */
export async function currentRegistryVersion(db: Db): Promise<number> {
  return (await readRegistryVersion(db)).version;
}

export interface RegistryChange {
  kind: string;
  referenceId?: number | null;
  extractionId?: number | null;
  effectId?: number | null;
  actorId?: number | null;
  details?: Record<string, unknown>;
}

/** Records a change to what settled data shows; call it inside the transaction of the change. Returns the new version. */
export async function bumpRegistry(trx: Knex.Transaction, change: RegistryChange): Promise<number> {
  const [row] = await trx('registry_changes')
    .insert({
      kind: change.kind,
      reference_id: change.referenceId ?? null,
      extraction_id: change.extractionId ?? null,
      effect_id: change.effectId ?? null,
      actor_id: change.actorId ?? null,
      details: JSON.stringify(change.details ?? {}),
    })
    .returning('id');
  return Number(row.id);
}
