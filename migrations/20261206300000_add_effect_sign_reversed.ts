import type { Knex } from 'knex';

// Whether an effect's sign was reversed to keep its outcome kind's convention (issue 11: a lower PSE or bisection
// point means lengthening); the reported values stay as reported, so the reversal can be audited.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.boolean('sign_reversed').notNullable().defaultTo(false);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.dropColumn('sign_reversed');
  });
}
