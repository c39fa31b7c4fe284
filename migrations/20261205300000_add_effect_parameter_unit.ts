import type { Knex } from 'knex';

// Each effect says what it measured (parameter) and in which unit (issue 11). The values are the vocabulary's
// (shared/vocabulary/parameters.ts); which go with which outcome kind is checked by the server on save.
const PARAMETERS = ['duration_ratio', 'pse', 'pss', 'jnd', 'window_width', 'window_centre', 'bisection_point', 'weber_fraction', 'recalibration_shift', 'lag'];
const UNITS = ['ms', 'deg', 'percent', 'ratio', 'none'];
const list = (xs: string[]) => xs.map((x) => `'${x}'`).join(',');

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.text('parameter').nullable();
    t.text('unit').nullable();
  });
  await knex.raw(`ALTER TABLE effects ADD CONSTRAINT effects_parameter_known CHECK (parameter IS NULL OR parameter IN (${list(PARAMETERS)}))`);
  await knex.raw(`ALTER TABLE effects ADD CONSTRAINT effects_unit_known CHECK (unit IS NULL OR unit IN (${list(UNITS)}))`);
  await knex.raw(`ALTER TABLE effects ADD CONSTRAINT effects_unit_with_parameter CHECK ((parameter IS NULL) = (unit IS NULL))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.dropColumn('unit');
    t.dropColumn('parameter');
  });
}
