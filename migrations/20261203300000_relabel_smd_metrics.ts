import type { Knex } from 'knex';

// Every stored standardized mean difference named by its standardizer, read from the formula it was computed
// with (formula ids kept their meaning when the engine named its metrics). Only the label changes: values,
// versions and timestamps stay. Frozen snapshots are immutable and keep the old key.
const G_BY_FORMULA: Record<string, string> = {
  'smd.ind.means': 'g_s',
  'smd.ind.means.ses': 'g_s',
  'smd.ind.means.medians': 'g_s',
  'smd.ind.t': 'g_s',
  'smd.ind.f': 'g_s',
  'smd.ind.p': 'g_s',
  'smd.ind.counts': 'g_s',
  'smd.ind.counts.corrected': 'g_s',
  'smd.paired.sd_diff': 'g_rm',
  'smd.paired.t_r': 'g_rm',
  'smd.paired.p_r': 'g_rm',
  'smd.paired.sds': 'g_av',
  'smd.paired.dz_t': 'g_z',
  'smd.paired.dz_sd_diff': 'g_z',
  'smd.paired.dz_sds': 'g_z',
  'smd.paired.dz_p': 'g_z',
};
const OLD = 'hedges_g';

export async function up(knex: Knex): Promise<void> {
  for (const [formula, metric] of Object.entries(G_BY_FORMULA)) await knex('effects').where({ metric: OLD, formula }).update({ metric });
  // Without a known formula the form says which: two groups are g_s; within subject, r (reported or assumed) gives g_rm, else g_z.
  await knex('effects').where({ metric: OLD, report_form: 'smd' }).update({ metric: 'g_s' });
  await knex('effects')
    .where({ metric: OLD, report_form: 'smd_paired' })
    .update({ metric: knex.raw(`CASE WHEN assumed_r IS NOT NULL OR (reported -> 'r') IS NOT NULL THEN 'g_rm' ELSE 'g_z' END`) });
  const left = await knex('effects').where({ metric: OLD }).count<{ c: number }[]>({ c: '*' });
  if (Number(left[0].c) > 0) throw new Error(`${left[0].c} effects labelled ${OLD} have neither a known formula nor a standardized-mean-difference form`);
}

export async function down(knex: Knex): Promise<void> {
  await knex('effects').whereIn('metric', ['g_s', 'g_av', 'g_rm', 'g_z']).update({ metric: OLD });
}
