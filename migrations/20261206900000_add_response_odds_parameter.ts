import type { Knex } from 'knex';

// 2×2 counts of judgements (e.g. “longer”/“shorter” per group) record the odds of a response (issue 11).
const BEFORE = ['duration_ratio', 'pse', 'pss', 'jnd', 'window_width', 'window_centre', 'bisection_point', 'weber_fraction', 'recalibration_shift', 'lag'];
const AFTER = [...BEFORE, 'response_odds'];
const list = (xs: string[]) => xs.map((x) => `'${x}'`).join(',');

async function allow(knex: Knex, parameters: string[]): Promise<void> {
  await knex.raw('ALTER TABLE effects DROP CONSTRAINT effects_parameter_known');
  await knex.raw(`ALTER TABLE effects ADD CONSTRAINT effects_parameter_known CHECK (parameter IS NULL OR parameter IN (${list(parameters)}))`);
}

export async function up(knex: Knex): Promise<void> {
  await allow(knex, AFTER);
}

export async function down(knex: Knex): Promise<void> {
  const used = await knex('effects').where({ parameter: 'response_odds' }).count<{ count: string }[]>({ count: '*' });
  if (Number(used[0].count) > 0)
    throw new Error(`${used[0].count} effect(s) record the parameter response_odds; recode them before going down (nothing is dropped silently)`);
  await allow(knex, BEFORE);
}
