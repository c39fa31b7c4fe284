import type { Knex } from 'knex';

/** Filters over settled effects (each optional; manipulation may list several terms). */
export interface SettledEffectFilters {
  manipulation?: string | string[];
  outcome?: string;
  metric?: string;
  population?: string;
  modality?: string;
  task?: string;
  design?: string;
  yearFrom?: number;
  yearTo?: number;
  referenceId?: number;
}

export interface SettledEffectRow {
  id: number;
  referenceId: number;
  /** stable across reopened versions of the settled record: group dependent effects by it */
  studyId: number;
  studyLabel: string;
  /** first author + year, e.g. "Okafor 2019" */
  referenceLabel: string;
  year: number | null;
  outcome: string;
  manipulation: string;
  manipulationLabel: string;
  metric: string;
  effect: number;
  variance: number;
  formula: string;
  assumedR: number | null;
  n: number | null;
  design: string | null;
  population: string | null;
  diagnosis: string | null;
  modality: string | null;
  task: string | null;
  standardMs: number | null;
  label: string;
  doi: string | null;
  title: string;
  recordId: number;
  recordVersion: number;
}

export interface SettledEffectPaging {
  page: number;
  pageSize: number;
  sort?: 'id' | 'year' | 'effect' | 'variance' | 'reference' | 'manipulation' | 'outcome';
  order?: 'asc' | 'desc';
}

const SORT_COLUMNS: Record<NonNullable<SettledEffectPaging['sort']>, string> = {
  id: 'f.id',
  year: 'r.year',
  effect: 'f.effect',
  variance: 'f.variance',
  reference: 'r.first_author',
  manipulation: 'm.term',
  outcome: 'f.outcome',
};

/**
 * The one definition of a settled effect: an effect of the current settled record (not superseded), not
 * withdrawn, with a computed value, of a reference that was not merged away. Every reader of settled data
 * (the effects API, the synthesis, the atlas) starts from this.
 */
export function settledEffectsFrom(db: Knex | Knex.Transaction) {
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
  if (f.metric) q.where('f.metric', f.metric);
  if (f.population) q.where('s.population', f.population);
  if (f.modality) q.where('s.modality', f.modality);
  if (f.task) q.where('s.task', f.task);
  if (f.design) q.where('s.design', f.design);
  if (f.yearFrom !== undefined) q.where('r.year', '>=', f.yearFrom);
  if (f.yearTo !== undefined) q.where('r.year', '<=', f.yearTo);
  if (f.referenceId !== undefined) q.where('r.id', f.referenceId);
}

function settledBase(db: Knex | Knex.Transaction, f: SettledEffectFilters) {
  return settledEffectsFrom(db)
    .join('manipulations as m', 'm.id', 'f.manipulation_id')
    .modify((q) => {
      if (f.manipulation !== undefined) {
        const terms = Array.isArray(f.manipulation) ? f.manipulation : [f.manipulation];
        q.whereIn('m.term', terms);
      }
      applyStudyFilters(q, f);
    });
}

function toRow(r: Record<string, any>): SettledEffectRow {
  return {
    id: r.id,
    referenceId: r.reference_id,
    studyId: r.study_id,
    studyLabel: r.study_label || `Study ${r.study_position}`,
    referenceLabel: `${r.first_author ?? 'Anon.'} ${r.year ?? 'n.d.'}`,
    year: r.year ?? null,
    outcome: r.outcome,
    manipulation: r.term,
    manipulationLabel: r.manipulation_label,
    metric: r.metric,
    effect: Number(r.effect),
    variance: Number(r.variance),
    formula: r.formula,
    assumedR: r.assumed_r == null ? null : Number(r.assumed_r),
    n: r.n_total ?? null,
    design: r.design ?? null,
    population: r.population ?? null,
    diagnosis: r.diagnosis ?? null,
    modality: r.modality ?? null,
    task: r.task ?? null,
    standardMs: r.standard_ms == null ? null : Number(r.standard_ms),
    label: r.label ?? '',
    doi: r.doi ?? null,
    title: r.title,
    recordId: r.extraction_id,
    recordVersion: r.record_version,
  };
}

const COLUMNS = [
  'f.id', 'f.outcome', 'f.metric', 'f.effect', 'f.variance', 'f.formula', 'f.assumed_r', 'f.n_total', 'f.label', 'f.extraction_id',
  'x.reference_id', 'x.record_version', 's.study_id', 's.label as study_label', 's.position as study_position', 's.design', 's.population',
  's.diagnosis', 's.modality', 's.task', 's.standard_ms', 'r.first_author', 'r.year', 'r.doi', 'r.title', 'm.term', 'm.label as manipulation_label',
];

/**
 * Settled effects matching the filters, ordered by id (or the given sort). Without paging, every match.
 * Example: querySettledEffects(db, { manipulation: 'luminance', outcome: 'duration_distortion' }).
 */
export async function querySettledEffects(
  db: Knex | Knex.Transaction,
  filters: SettledEffectFilters = {},
  paging?: SettledEffectPaging,
): Promise<SettledEffectRow[]> {
  const q = settledBase(db, filters).select(COLUMNS);
  if (paging) {
    q.orderBy(SORT_COLUMNS[paging.sort ?? 'id'], paging.order ?? 'asc').orderBy('f.id', 'asc');
    q.limit(paging.pageSize).offset((paging.page - 1) * paging.pageSize);
  } else q.orderBy('f.id', 'asc');
  return (await q).map(toRow);
}

export async function countSettledEffects(db: Knex | Knex.Transaction, filters: SettledEffectFilters = {}): Promise<number> {
  const [{ count }] = await settledBase(db, filters).count<{ count: string }[]>({ count: 'f.id' });
  return Number(count);
}

/** One settled effect by id, or null when it is not (or no longer) part of the settled registry. */
export async function getSettledEffect(db: Knex | Knex.Transaction, id: number): Promise<SettledEffectRow | null> {
  const row = await settledBase(db, {}).where('f.id', id).first(COLUMNS);
  return row ? toRow(row) : null;
}
