import type { Knex } from 'knex';

// The metric key hedges_g left in discrepancy history (the effect values each coder's sheet computed) and in
// followed synthesis requests, named by standardizer as 20261203300000 did for effects. Values stay.
const OLD = 'hedges_g';
const NEW = ['g_s', 'g_av', 'g_rm', 'g_z'];
type Value = { form?: string | null; reported?: Record<string, unknown> | null; assumedR?: number | null; metric?: string | null };

/** The standardizer a stored value was computed with, from its form and what was reported (as computeEffect decides). */
export function standardizerOf(v: Value): string {
  const o = v.reported ?? {};
  const has = (...k: string[]) => k.every((x) => o[x] !== undefined && o[x] !== null);
  const withR = has('r') || (v.assumedR !== undefined && v.assumedR !== null);
  if (v.form === 'smd') return 'g_s';
  if (v.form === 'd_z') return 'g_z';
  if (v.form === 'smd_paired') {
    if (has('mean_diff', 'sd_diff', 'n')) return withR ? 'g_rm' : 'g_z';
    if (has('mean1', 'sd1', 'mean2', 'sd2', 'n') && withR) return 'g_av';
    return withR ? 'g_rm' : 'g_z';
  }
  throw new Error(`a value labelled ${OLD} has neither a standardized-mean-difference form nor a known one (${String(v.form)})`);
}

const COLS = ['value_a', 'value_b', 'resolved_value'] as const;
const isOld = (v: unknown): v is Value => typeof v === 'object' && v !== null && (v as Value).metric === OLD;
const isNew = (v: unknown): v is Value => typeof v === 'object' && v !== null && NEW.includes(String((v as Value).metric));

async function relabelDiscrepancies(trx: Knex.Transaction, pick: (v: unknown) => boolean, to: (v: Value) => string) {
  const rows = await trx('discrepancies').where({ field: 'effect' }).select('id', ...COLS);
  for (const r of rows) {
    const patch: Record<string, string> = {};
    for (const c of COLS) if (pick(r[c])) patch[c] = JSON.stringify({ ...r[c], metric: to(r[c]) });
    if (Object.keys(patch).length > 0) await trx('discrepancies').where({ id: r.id }).update(patch);
  }
}

export async function up(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    await relabelDiscrepancies(trx, isOld, standardizerOf);
    // A followed request for hedges_g pooled every standardized mean difference; g_z is never pooled with the
    // others now, so it follows the raw-score family (g_s, g_av, g_rm). The ids relabelled are kept for down().
    await trx.schema.createTable('follows_relabelled_smd', (t) => {
      t.integer('follow_id').primary().references('follows.id').onDelete('CASCADE');
    });
    const follows = await trx('follows').whereRaw(`request -> 'filters' ->> 'metric' = ?`, [OLD]).select('id', 'request');
    for (const f of follows) {
      const filters = { ...f.request.filters };
      delete filters.metric;
      await trx('follows').where({ id: f.id }).update({ request: JSON.stringify({ ...f.request, filters, smdFamily: 'raw_score' }) });
      await trx('follows_relabelled_smd').insert({ follow_id: f.id });
    }
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    await relabelDiscrepancies(trx, isNew, () => OLD);
    const follows = await trx('follows').whereIn('id', trx('follows_relabelled_smd').select('follow_id')).select('id', 'request');
    for (const f of follows) {
      const { smdFamily: _s, ...rest } = f.request;
      await trx('follows').where({ id: f.id }).update({ request: JSON.stringify({ ...rest, filters: { ...rest.filters, metric: OLD } }) });
    }
    await trx.schema.dropTable('follows_relabelled_smd');
  });
}
