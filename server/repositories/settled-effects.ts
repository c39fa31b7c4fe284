import type { Knex } from 'knex';
import type { Db } from './db.js';

/** Filters over settled effects (each optional; manipulation may list several terms). */
export interface SettledEffectFilters {
  manipulation?: string | string[];
  outcome?: string;
  parameter?: string;
  unit?: string;
  /** leave out effects computed from a reported bound (p < …) / from a median (approximate) */
  excludeBound?: boolean;
  excludeApproximate?: boolean;
  /** one metric, or several (a synthesis pooling an SMD family) */
  metric?: string | string[];
  population?: string;
  modality?: string;
  task?: string;
  design?: string;
  yearFrom?: number;
  yearTo?: number;
  referenceId?: number;
}

/**
 * The one definition of a settled effect: an effect of the current settled record (not superseded), not
 * withdrawn, with a computed value, of a reference that was not merged away. Every reader of settled data
 * (the effects API, the synthesis, the atlas) starts from this.
 */
export function settledEffectsFrom(db: Db) {
  return db('effects as f')
    .join('extractions as x', 'x.id', 'f.extraction_id')
    .join('extraction_studies as s', 's.id', 'f.extraction_study_id')
    .join('refs as r', 'r.id', 'x.reference_id')
    .where({ 'x.kind': 'settled', 'x.state': 'settled' })
    .whereNull('x.superseded_by')
    .whereNull('f.withdrawn_at')
    .whereNull('r.merged_into')
    .whereNotNull('f.effect');
}

/** The filters other than manipulation, on a query built from settledEffectsFrom. */
export function applyStudyFilters(q: Knex.QueryBuilder, f: SettledEffectFilters) {
  if (f.outcome) q.where('f.outcome', f.outcome);
  if (f.parameter) q.where('f.parameter', f.parameter);
  if (f.unit) q.where('f.unit', f.unit);
  if (f.excludeBound) q.where('f.from_bound', false);
  if (f.excludeApproximate) q.where('f.approximate', false);
  if (Array.isArray(f.metric)) q.whereIn('f.metric', f.metric);
  else if (f.metric) q.where('f.metric', f.metric);
  if (f.population) q.where('s.population', f.population);
  if (f.modality) q.where('s.modality', f.modality);
  if (f.task) q.where('s.task', f.task);
  if (f.design) q.where('s.design', f.design);
  if (f.yearFrom !== undefined) q.where('r.year', '>=', f.yearFrom);
  if (f.yearTo !== undefined) q.where('r.year', '<=', f.yearTo);
  if (f.referenceId !== undefined) q.where('r.id', f.referenceId);
}


export async function settledEffectCountOf(db: Db, referenceId: number): Promise<number> {
  const row = await settledEffectsFrom(db).where('x.reference_id', referenceId).count({ n: '*' }).first();
  return Number(row?.n ?? 0);
}

/** The current settled records of a reference that hold settled effects, locked (a screening exclusion withdraws them). */
export async function lockSettledRecordsOf(trx: Knex.Transaction, referenceId: number): Promise<number[]> {
  const rows: { id: number }[] = await trx('extractions')
    .whereIn('id', settledEffectsFrom(trx).where('x.reference_id', referenceId).distinct('x.id'))
    .orderBy('id')
    .forUpdate()
    .select('id');
  return rows.map((r) => r.id);
}
