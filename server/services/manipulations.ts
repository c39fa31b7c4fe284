import type { Knex } from 'knex';
import { pageOf } from '../../shared/schemas/common.js';
import type { Manipulation, ManipulationPage, ManipulationResult } from '../../shared/schemas/registry.js';
import { ConflictError, NotFoundError, ValidationError } from '../lib/errors.js';
import { recordAudit } from '../repositories/audit.js';
import type { Db, PageRequest } from '../repositories/db.js';
import { ensureVocabulary, findManipulation, insertManipulation, listManipulations as manipulationRows, lockManipulation, termIds, updateManipulation as updateManipulationRow } from '../repositories/manipulations.js';
import type { ManipulationRow } from '../repositories/rows.js';
import { bumpRegistry } from '../repositories/registry-version.js';
import { loginOf } from '../repositories/users.js';

export { DEFAULT_MANIPULATIONS } from '../../shared/vocabulary/manipulations.js';
export { ensureVocabulary };

/** Maps terms to manipulation ids; a default term missing from the table is added, any other unknown term is refused. */
export async function resolveManipulations(db: Db, terms: string[]): Promise<Map<string, number>> {
  const { ids, unknown } = await termIds(db, terms);
  if (unknown.length) {
    throw new ValidationError(`Unknown manipulation term${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}.`, unknown.map((t) => ({ path: 'manipulation', message: `no term "${t}" in the vocabulary` })));
  }
  return ids;
}

function toManipulation(r: ManipulationRow & { settled_effects?: number }): Manipulation {
  return {
    id: r.id,
    term: r.term,
    label: r.label,
    description: r.description,
    retired: r.retired_at != null,
    retiredAt: r.retired_at ? new Date(r.retired_at).toISOString() : null,
    version: r.version,
    settledEffects: Number(r.settled_effects ?? 0),
  };
}

export async function listManipulations(db: Knex, opts: PageRequest & { includeRetired: boolean; sort: 'term' | 'label' | 'effects'; order: 'asc' | 'desc' }): Promise<ManipulationPage> {
  const { total, rows } = await manipulationRows(db, opts);
  return pageOf(rows.map(toManipulation), total, opts);
}

export async function createManipulation(db: Knex, actorId: number, input: { term: string; label: string; description: string }): Promise<ManipulationResult> {
  return db.transaction(async (trx) => {
    const exists = await findManipulation(trx, input.term);
    if (exists) throw new ConflictError(`The term "${input.term}" is already in the vocabulary.`);
    const row = await insertManipulation(trx, { ...input, updated_by: actorId });
    await recordAudit(trx, { actorId, action: 'manipulation.create', entityType: 'manipulation', entityId: row.id, details: input });
    // The atlas lists every live term, with or without effects.
    await bumpRegistry(trx, { kind: 'manipulation.create', actorId, details: { term: input.term } });
    return { manipulation: toManipulation(row) };
  });
}

export async function updateManipulation(db: Knex, actorId: number, term: string, input: { version: number; label?: string; description?: string; retired?: boolean }): Promise<ManipulationResult> {
  return db.transaction(async (trx) => {
    const row = await lockManipulation(trx, term);
    if (!row) throw new NotFoundError(`No manipulation "${term}".`);
    if (row.version !== input.version) {
      const who = await loginOf(trx, row.updated_by);
      throw new ConflictError(`"${term}" was changed by ${who ?? 'someone else'} since you opened it (version ${row.version}); reload and try again.`, { currentVersion: row.version, changedBy: who });
    }
    const updated = await updateManipulationRow(trx, row, { label: input.label, description: input.description, retired: input.retired, actorId });
    await recordAudit(trx, { actorId, action: 'manipulation.update', entityType: 'manipulation', entityId: row.id, details: { term, ...input } });
    // The label travels with settled effects in analyses and exports; the atlas shows label, description and live terms.
    const was = { label: row.label, description: row.description, retired: row.retired_at != null };
    const changed = (['label', 'description', 'retired'] as const).filter((k) => input[k] !== undefined && input[k] !== was[k]);
    if (changed.length) await bumpRegistry(trx, { kind: changed.includes('label') ? 'manipulation.relabel' : 'manipulation.edit', actorId, details: { term, changed } });
    return { manipulation: toManipulation(updated) };
  });
}
