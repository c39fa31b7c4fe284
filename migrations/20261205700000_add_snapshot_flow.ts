import type { Knex } from 'knex';

// The flow of records into the synthesis a snapshot froze (PRISMA 2020, stage by stage); older snapshots keep null.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('snapshots', (t) => {
    t.jsonb('flow');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('snapshots', (t) => {
    t.dropColumn('flow');
  });
}
