import type { Knex } from 'knex';

// An effect computed from a reported bound (p < .001 kept as .001) or from a median with quartiles or range
// (Wan et al. 2014) says so, and a synthesis may leave such effects out (issue 11). No stored effect could be
// either before: the sheet had no such inputs, so every row starts false.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.boolean('from_bound').notNullable().defaultTo(false);
    t.boolean('approximate').notNullable().defaultTo(false);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.dropColumn('approximate');
    t.dropColumn('from_bound');
  });
}
