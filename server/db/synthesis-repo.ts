import type { Knex } from 'knex';
import { applyStudyFilters, settledEffectsFrom, type SettledEffectFilters } from './effects-repo.js';
import type { SettledEffect } from '../../shared/synthesis/types.js';

/**
 * The settled effects a synthesis needs, and only the columns it pools or groups by: the same rows, in the
 * same order (by id), as querySettledEffects, from the same settledEffectsFrom definition. Manipulation terms are resolved to ids first so
 * the planner can use the effects index instead of scanning every effect (the difference between 2 ms
 * and 40 ms for 200 of 50,000 effects); a test holds the two queries to the same answer.
 */
const COLS = ['id', 'outcome', 'metric', 'effect', 'variance', 'n_total', 'manipulation_id', 'reference_id', 'study_id', 'study_label', 'study_position', 'design', 'population', 'modality', 'task', 'standard_ms', 'first_author', 'year'];

export async function querySynthesisRows(db: Knex | Knex.Transaction, f: SettledEffectFilters): Promise<SettledEffect[]> {
  const terms = f.manipulation === undefined ? null : Array.isArray(f.manipulation) ? f.manipulation : [f.manipulation];
  const manips: Array<{ id: number; term: string; label: string }> = await db('manipulations')
    .modify((q) => {
      if (terms) q.whereIn('term', terms);
    })
    .select('id', 'term', 'label');
  if (terms && manips.length === 0) return [];
  const byId = new Map(manips.map((m) => [m.id, m]));
  const inner = settledEffectsFrom(db)
    .modify((q) => {
      if (terms) q.whereIn('f.manipulation_id', [...byId.keys()]);
      else q.whereNotNull('f.manipulation_id');
      applyStudyFilters(q, f);
    })
    .select(
      'f.id', 'f.outcome', 'f.metric', 'f.effect', 'f.variance', 'f.n_total', 'f.manipulation_id', 'x.reference_id', 's.study_id',
      's.label as study_label', 's.position as study_position', 's.design', 's.population', 's.modality', 's.task', 's.standard_ms', 'r.first_author', 'r.year',
    );
  // Rows as arrays, not objects: fewer allocations for 50,000 rows (the driver's array row mode through knex's raw connection).
  inner.orderBy('f.id', 'asc');
  let rows: unknown[][];
  if ((db as Knex.Transaction).isTransaction) {
    // inside a transaction the query must use the transaction's own connection
    rows = (await inner).map((r: Record<string, unknown>) => COLS.map((c) => r[c]));
  } else {
    const { sql, bindings } = inner.toSQL().toNative();
    const conn = await db.client.acquireConnection();
    try {
      rows = (await conn.query({ text: sql, values: bindings, rowMode: 'array' })).rows;
    } finally {
      await db.client.releaseConnection(conn);
    }
  }
  const out: SettledEffect[] = new Array(rows.length);
  for (let i = 0; i < rows.length; i++) {
    const [id, outcome, metric, effect, variance, nTotal, manipulationId, referenceId, studyId, studyLabel, studyPosition, design, population, modality, task, standardMs, firstAuthor, year] =
      rows[i] as [number, string, string, number, number, number | null, number, number, number, string, number, string | null, string | null, string | null, string | null, number | null, string | null, number | null];
    const m = byId.get(manipulationId);
    out[i] = {
      id,
      referenceId,
      studyId,
      studyLabel: studyLabel || `Study ${studyPosition}`,
      referenceLabel: `${firstAuthor ?? 'Anon.'} ${year ?? 'n.d.'}`,
      year: year ?? null,
      outcome,
      manipulation: m?.term ?? '',
      manipulationLabel: m?.label ?? '',
      metric,
      effect: Number(effect),
      variance: Number(variance),
      n: nTotal ?? null,
      design: design ?? null,
      population: population ?? null,
      modality: modality ?? null,
      task: task ?? null,
      standardMs: standardMs == null ? null : Number(standardMs),
    };
  }
  return out;
}
