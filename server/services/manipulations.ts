import type { Knex } from 'knex';
import { settledEffectsFrom } from '../db/effects-repo.js';
import { ConflictError, NotFoundError, ValidationError } from '../lib/errors.js';
import { recordAudit } from './audit.js';
import { bumpRegistry } from '../db/registry-version.js';

/** The seeded manipulation vocabulary (term is a stable slug; curators may relabel or retire). */
export const DEFAULT_MANIPULATIONS: ReadonlyArray<{ term: string; label: string; description: string }> = [
  { term: 'luminance', label: 'Luminance', description: 'Brighter versus dimmer stimuli of the same physical duration.' },
  { term: 'size', label: 'Size', description: 'Larger versus smaller stimuli.' },
  { term: 'numerosity', label: 'Numerosity', description: 'More versus fewer items in the display.' },
  { term: 'speed_motion', label: 'Speed / motion', description: 'Moving or faster stimuli versus static or slower ones.' },
  { term: 'looming_receding', label: 'Looming vs receding', description: 'Approaching versus receding stimuli.' },
  { term: 'flicker_rate', label: 'Flicker rate', description: 'Temporal frequency of a flickering stimulus.' },
  { term: 'loudness', label: 'Loudness', description: 'Louder versus softer tones.' },
  { term: 'pitch', label: 'Pitch', description: 'Higher versus lower pitched tones.' },
  { term: 'repetition', label: 'Repetition', description: 'Repeated versus first-presented stimuli.' },
  { term: 'novelty_oddball', label: 'Novelty / oddball', description: 'An oddball among repeated standards.' },
  { term: 'expectation', label: 'Expectation', description: 'Expected versus unexpected stimuli or timing.' },
  { term: 'emotional_arousal', label: 'Emotional arousal', description: 'Arousing versus neutral stimuli.' },
  { term: 'threat', label: 'Threat', description: 'Threatening versus safe contexts or stimuli.' },
  { term: 'delay_adaptation', label: 'Delay adaptation', description: 'Exposure to a constant intersensory or action–outcome delay.' },
  { term: 'saccade', label: 'Saccade', description: 'Stimuli presented around a saccadic eye movement.' },
  { term: 'voluntary_action', label: 'Voluntary action', description: 'Self-initiated versus passive or externally triggered events.' },
];

/** Inserts any missing vocabulary term (never changes an existing one). */
export async function ensureVocabulary(db: Knex | Knex.Transaction): Promise<void> {
  await db('manipulations')
    .insert(DEFAULT_MANIPULATIONS.map((m) => ({ term: m.term, label: m.label, description: m.description })))
    .onConflict('term')
    .ignore();
}

/** Maps terms to manipulation ids; a default term missing from the table is added, any other unknown term is refused. */
export async function resolveManipulations(trx: Knex | Knex.Transaction, terms: string[]): Promise<Map<string, number>> {
  const wanted = [...new Set(terms)];
  const map = new Map<string, number>();
  if (!wanted.length) return map;
  let rows: { id: number; term: string }[] = await trx('manipulations').whereIn('term', wanted).select('id', 'term');
  const missing = wanted.filter((t) => !rows.some((r) => r.term === t));
  const defaults = DEFAULT_MANIPULATIONS.filter((m) => missing.includes(m.term));
  if (defaults.length) {
    await trx('manipulations').insert(defaults.map((m) => ({ ...m }))).onConflict('term').ignore();
    rows = await trx('manipulations').whereIn('term', wanted).select('id', 'term');
  }
  for (const r of rows) map.set(r.term, r.id);
  const unknown = wanted.filter((t) => !map.has(t));
  if (unknown.length) {
    throw new ValidationError(`Unknown manipulation term${unknown.length > 1 ? 's' : ''}: ${unknown.join(', ')}.`, unknown.map((t) => ({ path: 'manipulation', message: `no term "${t}" in the vocabulary` })));
  }
  return map;
}

export interface ManipulationRow {
  id: number;
  term: string;
  label: string;
  description: string;
  retired: boolean;
  retiredAt: string | null;
  version: number;
  settledEffects: number;
}

export async function listManipulations(db: Knex, opts: { includeRetired: boolean; sort: 'term' | 'label' | 'effects'; order: 'asc' | 'desc'; page: number; pageSize: number }) {
  const counts = settledEffectsFrom(db)
    .groupBy('f.manipulation_id')
    .select('f.manipulation_id', db.raw('count(*)::int as n'))
    .as('c');
  const base = db('manipulations as m').modify((q) => {
    if (!opts.includeRetired) q.whereNull('m.retired_at');
  });
  const [{ count }] = await base.clone().count<{ count: string }[]>({ count: '*' });
  const sortCol = opts.sort === 'effects' ? db.raw('coalesce(c.n, 0)') : `m.${opts.sort}`;
  const rows = await base
    .clone()
    .leftJoin(counts, 'c.manipulation_id', 'm.id')
    .select('m.*', db.raw('coalesce(c.n, 0)::int as settled_effects'))
    .orderBy(sortCol as any, opts.order)
    .orderBy('m.term', 'asc')
    .limit(opts.pageSize)
    .offset((opts.page - 1) * opts.pageSize);
  return { total: Number(count), items: rows.map(toManipulation) };
}

function toManipulation(r: Record<string, any>): ManipulationRow {
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

export async function createManipulation(db: Knex, actorId: number, input: { term: string; label: string; description: string }) {
  return db.transaction(async (trx) => {
    const exists = await trx('manipulations').where({ term: input.term }).first('id');
    if (exists) throw new ConflictError(`The term "${input.term}" is already in the vocabulary.`);
    const [row] = await trx('manipulations').insert({ ...input, updated_by: actorId }).returning('*');
    await recordAudit(trx, { actorId, action: 'manipulation.create', entityType: 'manipulation', entityId: row.id, details: input });
    return toManipulation(row);
  });
}

export async function updateManipulation(
  db: Knex,
  actorId: number,
  term: string,
  input: { version: number; label?: string; description?: string; retired?: boolean },
) {
  return db.transaction(async (trx) => {
    const row = await trx('manipulations').where({ term }).forUpdate().first();
    if (!row) throw new NotFoundError(`No manipulation "${term}".`);
    if (row.version !== input.version) {
      const who = row.updated_by ? await trx('users').where({ id: row.updated_by }).first('login') : null;
      throw new ConflictError(`"${term}" was changed by ${who?.login ?? 'someone else'} since you opened it (version ${row.version}); reload and try again.`, { currentVersion: row.version, changedBy: who?.login ?? null });
    }
    const patch: Record<string, unknown> = { version: row.version + 1, updated_by: actorId, updated_at: trx.fn.now() };
    if (input.label !== undefined) patch.label = input.label;
    if (input.description !== undefined) patch.description = input.description;
    if (input.retired !== undefined) patch.retired_at = input.retired ? (row.retired_at ?? trx.fn.now()) : null;
    const [updated] = await trx('manipulations').where({ id: row.id }).update(patch).returning('*');
    await recordAudit(trx, { actorId, action: 'manipulation.update', entityType: 'manipulation', entityId: row.id, details: { term, ...input } });
    // The label travels with settled effects in analyses and exports.
    if (input.label !== undefined && input.label !== row.label) await bumpRegistry(trx, { kind: 'manipulation.relabel', actorId, details: { term } });
    return toManipulation(updated);
  });
}
