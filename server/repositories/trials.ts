// Trial data sets, their rows (bulk insert through unnest) and their fits.
import type { Knex } from 'knex';
import type { TrialRow } from '../../shared/trials/csv.js';
import type { Db } from './db.js';
import type { Json, TrialDataRow, TrialFitRow, TrialSetRow } from './rows.js';

export type NewTrialSet = Pick<
  TrialSetRow,
  'extraction_id' | 'label' | 'task' | 'model' | 'modality' | 'format' | 'file_name' | 'row_count' | 'trial_count' | 'participant_count' | 'conditions' | 'level_min' | 'level_max' | 'uploaded_by'
>;

export type TrialSetWithUploader = TrialSetRow & { uploaded_by_login: string | null };

export async function insertTrialSet(trx: Knex.Transaction, set: NewTrialSet): Promise<TrialSetRow> {
  const [row] = await trx<TrialSetRow>('trial_sets')
    .insert({ ...set, conditions: JSON.stringify(set.conditions) as unknown as string[] })
    .returning('*');
  return row;
}

const CHUNK = 20_000;

/** Inserts rows with one statement per 20,000 rows (arrays unnested by PostgreSQL). */
export async function insertTrialRows(trx: Knex.Transaction, setId: number, rows: readonly TrialRow[]): Promise<void> {
  for (let i = 0; i < rows.length; i += CHUNK) {
    const part = rows.slice(i, i + CHUNK);
    await trx.raw(
      `INSERT INTO trial_rows (trial_set_id, line, participant, condition, level, n, k)
       SELECT ?, * FROM unnest(?::int[], ?::text[], ?::text[], ?::float8[], ?::int[], ?::int[])`,
      [setId, part.map((r) => r.line), part.map((r) => r.participant), part.map((r) => r.condition), part.map((r) => r.level), part.map((r) => r.n), part.map((r) => r.k)],
    );
  }
}

const withUploader = (db: Db) => db('trial_sets as s').leftJoin('users as u', 'u.id', 's.uploaded_by').select('s.*', 'u.login as uploaded_by_login');

export async function findTrialSet(db: Db, id: number): Promise<TrialSetWithUploader | undefined> {
  return withUploader(db).where('s.id', id).first();
}

export async function lockTrialSet(trx: Knex.Transaction, id: number): Promise<TrialSetRow | undefined> {
  return trx<TrialSetRow>('trial_sets').where({ id }).forUpdate().first();
}

export async function trialSetsOf(db: Db, extractionId: number): Promise<TrialSetWithUploader[]> {
  return withUploader(db).where('s.extraction_id', extractionId).orderBy('s.id');
}

export async function trialSetsByIds(db: Db, ids: number[]): Promise<TrialSetWithUploader[]> {
  if (!ids.length) return [];
  return withUploader(db).whereIn('s.id', ids).orderBy('s.id');
}

export async function updateTrialSet(db: Db, id: number, patch: Partial<Pick<TrialSetRow, 'fit_state' | 'fit_done' | 'fit_total' | 'fit_resamples' | 'fit_error' | 'fit_job_id'>> & { fittedNow?: boolean }) {
  const { fittedNow, ...rest } = patch;
  await db('trial_sets').where({ id }).update({ ...rest, ...(fittedNow ? { fitted_at: db.fn.now() } : {}) });
}

export async function deleteTrialSet(trx: Knex.Transaction, id: number): Promise<void> {
  await trx('trial_sets').where({ id }).delete();
}

export async function trialRowsOf(db: Db, setId: number): Promise<Pick<TrialDataRow, 'line' | 'participant' | 'condition' | 'level' | 'n' | 'k'>[]> {
  return db<TrialDataRow>('trial_rows').where({ trial_set_id: setId }).orderBy('line').select('line', 'participant', 'condition', 'level', 'n', 'k');
}

export async function replaceFits(trx: Knex.Transaction, setId: number, fits: { participant: string; condition: string; converged: boolean; result: Json }[]): Promise<void> {
  await trx('trial_fits').where({ trial_set_id: setId }).delete();
  for (let i = 0; i < fits.length; i += 1000) {
    await trx('trial_fits').insert(
      fits.slice(i, i + 1000).map((f, j) => ({ trial_set_id: setId, position: i + j + 1, participant: f.participant, condition: f.condition, converged: f.converged, result: JSON.stringify(f.result) })),
    );
  }
}

export async function fitsOf(db: Db, setId: number): Promise<TrialFitRow[]> {
  return db<TrialFitRow>('trial_fits').where({ trial_set_id: setId }).orderBy('position');
}

/** Trial sets that effects of the given extractions were derived from. */
export async function trialSetIdsOfEffects(db: Db, effectIds: number[]): Promise<number[]> {
  if (!effectIds.length) return [];
  const rows: { trial_set_id: number }[] = await db('effects').whereIn('id', effectIds).whereNotNull('trial_set_id').distinct('trial_set_id');
  return rows.map((r) => r.trial_set_id);
}

/** Number of participant × condition cells of a set (one fit each). */
export async function cellCount(db: Db, setId: number): Promise<number> {
  const { rows } = await db.raw(`SELECT count(*)::int AS c FROM (SELECT DISTINCT participant, condition FROM trial_rows WHERE trial_set_id = ?) t`, [setId]);
  return Number(rows[0].c);
}
