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

/** What a reference's settled effects cover, for its search document: manipulations, outcome kinds, tasks, records. */
export interface SettledCoverage {
  manipulations: Array<{ term: string; label: string }>;
  outcomes: string[];
  tasks: string[];
  records: number[];
}

export async function settledCoverageOf(db: Db, referenceIds: number[]): Promise<Map<number, SettledCoverage>> {
  const out = new Map<number, SettledCoverage>();
  if (!referenceIds.length) return out;
  const rows = (await settledEffectsFrom(db)
    .join('manipulations as m', 'm.id', 'f.manipulation_id')
    .whereIn('x.reference_id', referenceIds)
    .distinct('x.reference_id as ref', 'x.id as record', 'm.term', 'm.label', 'f.outcome', 's.task')
    .orderBy(['x.reference_id', 'x.id'])) as Array<{ ref: number; record: number; term: string; label: string; outcome: string; task: string | null }>;
  for (const r of rows) {
    let c = out.get(r.ref);
    if (!c) out.set(r.ref, (c = { manipulations: [], outcomes: [], tasks: [], records: [] }));
    if (!c.manipulations.some((m) => m.term === r.term)) c.manipulations.push({ term: r.term, label: r.label });
    if (!c.outcomes.includes(r.outcome)) c.outcomes.push(r.outcome);
    if (r.task && !c.tasks.includes(r.task)) c.tasks.push(r.task);
    if (!c.records.includes(r.record)) c.records.push(r.record);
  }
  return out;
}

/** References that ever had a settled record (current, superseded or withdrawn): those whose coverage can change. */
export async function referencesWithSettledRecords(db: Db): Promise<number[]> {
  const rows = (await db('extractions').where({ kind: 'settled' }).distinct('reference_id')) as Array<{ reference_id: number }>;
  return rows.map((r) => r.reference_id);
}

/**
 * Restricts a query over `refs` (unaliased) to references whose settled effects cover this manipulation, this
 * outcome kind and this task (each by some effect, as the search index's arrays match).
 */
export function whereSettledCovers(db: Db, f: { manipulation?: string; outcome?: string; task?: string }) {
  const covers = (column: string, value: string) =>
    settledEffectsFrom(db).join('manipulations as m', 'm.id', 'f.manipulation_id').whereRaw('x.reference_id = refs.id').where(column, value).select(db.raw('1'));
  return (qb: Knex.QueryBuilder) => {
    if (f.manipulation) qb.whereExists(covers('m.term', f.manipulation));
    if (f.outcome) qb.whereExists(covers('f.outcome', f.outcome));
    if (f.task) qb.whereExists(covers('s.task', f.task));
  };
}
