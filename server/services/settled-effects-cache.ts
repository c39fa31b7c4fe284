import type { Knex } from 'knex';
import type { SettledEffectFilters } from '../repositories/effects.js';
import { currentRegistryVersion, readRegistryVersion } from '../repositories/registry-version.js';
import { querySynthesisRows } from '../repositories/effects.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';

export interface Loaded {
  version: number;
  stamp: string;
  effects: SettledEffect[];
  /** the same effects by manipulation term, each list in id order */
  byManipulation: Map<string, SettledEffect[]>;
  /** recent filter results on this version (a synthesis asks for its effects twice: its size, then its run) */
  filtered: Map<string, SettledEffect[]>;
}

const FILTERED_KEPT = 8;

export function indexByManipulation(effects: SettledEffect[]) {
  const by = new Map<string, SettledEffect[]>();
  for (const e of effects) {
    const list = by.get(e.manipulation);
    if (list) list.push(e);
    else by.set(e.manipulation, [e]);
  }
  return by;
}

interface Slot {
  loaded?: Loaded;
  loading?: { stamp: string; promise: Promise<Loaded> };
}

const slots = new WeakMap<Knex, Slot>();

/**
 * Every settled effect, held in memory per registry version (which grows with every change to settled data,
 * a relabel included), so a synthesis filters in memory instead of decoding tens of thousands of rows from
 * PostgreSQL on each request. Each server process keeps its own copy; the version check is one indexed query.
 */
export async function settledEffectsAt(db: Knex): Promise<Loaded> {
  let slot = slots.get(db);
  if (!slot) slots.set(db, (slot = {}));
  const { version, stamp } = await readRegistryVersion(db);
  if (slot.loaded?.stamp === stamp) return slot.loaded;
  if (slot.loading?.stamp !== stamp) {
    const promise = querySynthesisRows(db, {}).then((effects) => {
      const loaded = { version, stamp, effects, byManipulation: indexByManipulation(effects), filtered: new Map<string, SettledEffect[]>() };
      if (!slot.loaded || slot.loaded.version <= version) slot.loaded = loaded;
      return loaded;
    });
    slot.loading = { stamp, promise };
    promise.finally(() => {
      if (slot.loading?.promise === promise) slot.loading = undefined;
    }).catch(() => undefined);
  }
  return slot.loading.promise;
}

/** The same rows, in the same order, as querySynthesisRows(db, filters) — a test holds the two together. */
export function filterSettledEffects(effects: readonly SettledEffect[], f: SettledEffectFilters): SettledEffect[] {
  const terms = f.manipulation === undefined ? null : new Set(Array.isArray(f.manipulation) ? f.manipulation : [f.manipulation]);
  const metrics = Array.isArray(f.metric) ? new Set(f.metric) : null;
  const out: SettledEffect[] = [];
  for (const e of effects) {
    if (terms && !terms.has(e.manipulation)) continue;
    if (f.outcome && e.outcome !== f.outcome) continue;
    if (f.parameter && e.parameter !== f.parameter) continue;
    if (f.unit && e.unit !== f.unit) continue;
    if (f.excludeBound && e.fromBound) continue;
    if (f.excludeApproximate && e.approximate) continue;
    if (metrics ? !metrics.has(e.metric) : f.metric && e.metric !== f.metric) continue;
    if (f.population && e.population !== f.population) continue;
    if (f.modality && e.modality !== f.modality) continue;
    if (f.task && e.task !== f.task) continue;
    if (f.design && e.design !== f.design) continue;
    if (f.yearFrom !== undefined && (e.year == null || e.year < f.yearFrom)) continue;
    if (f.yearTo !== undefined && (e.year == null || e.year > f.yearTo)) continue;
    if (f.referenceId !== undefined && e.referenceId !== f.referenceId) continue;
    out.push(e);
  }
  return out;
}

/** Settled effects matching the filters with the registry version they belong to; a transaction reads directly. */
export async function settledEffectsFor(db: Knex | Knex.Transaction, filters: SettledEffectFilters) {
  if ((db as Knex.Transaction).isTransaction) {
    const [registryVersion, effects] = await Promise.all([currentRegistryVersion(db), querySynthesisRows(db, filters)]);
    return { registryVersion, effects };
  }
  const loaded = await settledEffectsAt(db as Knex);
  return { registryVersion: loaded.version, effects: filterLoaded(loaded, filters) };
}

/** The effects of a loaded set that match the filters (kept for the set's recent filters when it holds `filtered`). */
export function filterLoaded(loaded: Pick<Loaded, 'effects' | 'byManipulation'> & { filtered?: Loaded['filtered'] }, filters: SettledEffectFilters): SettledEffect[] {
  const kept = loaded.filtered;
  const key = kept ? JSON.stringify(filters) : '';
  let effects = kept?.get(key);
  if (!effects) {
    effects = filterSettledEffects(candidates(loaded, filters), filters);
    if (kept) {
      if (kept.size >= FILTERED_KEPT) kept.delete(kept.keys().next().value!);
      kept.set(key, effects);
    }
  }
  return effects;
}

/** The set loaded last, without asking PostgreSQL whether it is still current (for estimates only). */
export function lastLoaded(db: Knex): Loaded | undefined {
  return slots.get(db)?.loaded;
}

/** Only the manipulations asked for, merged back into id order, instead of every settled effect. */
function candidates(loaded: Pick<Loaded, 'effects' | 'byManipulation'>, filters: SettledEffectFilters): readonly SettledEffect[] {
  if (filters.manipulation === undefined) return loaded.effects;
  const terms = [...new Set(Array.isArray(filters.manipulation) ? filters.manipulation : [filters.manipulation])];
  const lists = terms.map((t) => loaded.byManipulation.get(t) ?? []);
  if (lists.length === 1) return lists[0];
  return lists.flat().sort((a, b) => a.id - b.id);
}
