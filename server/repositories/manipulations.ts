import type { Knex } from 'knex';
import { DEFAULT_MANIPULATIONS } from '../../shared/vocabulary/manipulations.js';
import { countRows, pageOf, type Db, type PageRequest } from './db.js';
import type { ManipulationRow } from './rows.js';
import { settledEffectsFrom } from './settled-effects.js';

/** Inserts any missing default vocabulary term (never changes an existing one). */
export async function ensureVocabulary(db: Db): Promise<void> {
  await db('manipulations')
    .insert(DEFAULT_MANIPULATIONS.map((m) => ({ term: m.term, label: m.label, description: m.description })))
    .onConflict('term')
    .ignore();
}

/**
 * Maps terms to manipulation ids; a default term missing from the table is added first. Terms that are
 * neither known nor defaults come back in `unknown`.
 */
export async function termIds(db: Db, terms: string[]): Promise<{ ids: Map<string, number>; unknown: string[] }> {
  const wanted = [...new Set(terms)];
  const ids = new Map<string, number>();
  if (!wanted.length) return { ids, unknown: [] };
  let rows: Pick<ManipulationRow, 'id' | 'term'>[] = await db<ManipulationRow>('manipulations').whereIn('term', wanted).select('id', 'term');
  const missing = wanted.filter((t) => !rows.some((r) => r.term === t));
  const defaults = DEFAULT_MANIPULATIONS.filter((m) => missing.includes(m.term));
  if (defaults.length) {
    await db('manipulations').insert(defaults.map((m) => ({ ...m }))).onConflict('term').ignore();
    rows = await db<ManipulationRow>('manipulations').whereIn('term', wanted).select('id', 'term');
  }
  for (const r of rows) ids.set(r.term, r.id);
  return { ids, unknown: wanted.filter((t) => !ids.has(t)) };
}

export async function findManipulation(db: Db, term: string): Promise<ManipulationRow | undefined> {
  return db<ManipulationRow>('manipulations').where({ term }).first();
}

export async function lockManipulation(trx: Knex.Transaction, term: string): Promise<ManipulationRow | undefined> {
  return trx<ManipulationRow>('manipulations').where({ term }).forUpdate().first();
}

/** Terms in use (not retired), by label. */
export async function liveVocabulary(db: Db): Promise<Pick<ManipulationRow, 'term' | 'label' | 'description'>[]> {
  return db<ManipulationRow>('manipulations').whereNull('retired_at').orderBy('label').select('term', 'label', 'description');
}

/** Every term with its id and label (all of them, or those named). */
export async function manipulationsByTerm(db: Db, terms: string[] | null): Promise<Pick<ManipulationRow, 'id' | 'term' | 'label'>[]> {
  return db<ManipulationRow>('manipulations')
    .modify((q) => {
      if (terms) q.whereIn('term', terms);
    })
    .select('id', 'term', 'label');
}

export type ManipulationWithCount = ManipulationRow & { settled_effects: number };

export async function listManipulations(db: Db, opts: PageRequest & { includeRetired: boolean; sort: 'term' | 'label' | 'effects'; order: 'asc' | 'desc' }) {
  const counts = settledEffectsFrom(db).groupBy('f.manipulation_id').select('f.manipulation_id', db.raw('count(*)::int as n')).as('c');
  const base = db('manipulations as m').modify((q) => {
    if (!opts.includeRetired) q.whereNull('m.retired_at');
  });
  const total = await countRows(base);
  const rows: ManipulationWithCount[] = await pageOf(
    base
      .clone()
      .leftJoin(counts, 'c.manipulation_id', 'm.id')
      .select('m.*', db.raw('coalesce(c.n, 0)::int as settled_effects'))
      .orderBy(opts.sort === 'effects' ? 'settled_effects' : `m.${opts.sort}`, opts.order)
      .orderBy('m.term', 'asc'),
    opts,
  );
  return { total, rows };
}

export async function insertManipulation(trx: Knex.Transaction, m: Pick<ManipulationRow, 'term' | 'label' | 'description' | 'updated_by'>): Promise<ManipulationRow> {
  const [row] = await trx('manipulations').insert(m).returning('*');
  return row;
}

export async function updateManipulation(
  trx: Knex.Transaction,
  row: Pick<ManipulationRow, 'id' | 'version' | 'retired_at'>,
  patch: { label?: string; description?: string; retired?: boolean; actorId: number },
): Promise<ManipulationRow> {
  const set: Record<string, unknown> = { version: row.version + 1, updated_by: patch.actorId, updated_at: trx.fn.now() };
  if (patch.label !== undefined) set.label = patch.label;
  if (patch.description !== undefined) set.description = patch.description;
  if (patch.retired !== undefined) set.retired_at = patch.retired ? (row.retired_at ?? trx.fn.now()) : null;
  const [updated] = await trx('manipulations').where({ id: row.id }).update(set).returning('*');
  return updated;
}
