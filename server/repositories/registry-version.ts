import type { Knex } from 'knex';
import type { Db } from './db.js';

/**
 * The registry version: max(id) of registry_changes, which grows in the same transaction as every change
 * to settled data (settle, reopen, withdraw, a curator's edit). Caches and snapshots key on it.
 */
export async function currentRegistryVersion(db: Db): Promise<number> {
  const row = await db('registry_changes').max<{ v: string | number | null }>({ v: 'id' }).first();
  return row?.v == null ? 0 : Number(row.v);
}

export interface RegistryChange {
  kind: string;
  referenceId?: number | null;
  extractionId?: number | null;
  effectId?: number | null;
  actorId?: number | null;
  details?: Record<string, unknown>;
}

/** Records a change to settled data; call it inside the transaction of the change. Returns the new version. */
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

/** The newest registry change (its id and time), or undefined before the first. */
export async function latestRegistryChange(db: Db): Promise<{ id: number; at: Date | string } | undefined> {
  return db('registry_changes').orderBy('id', 'desc').first('id', 'at');
}
