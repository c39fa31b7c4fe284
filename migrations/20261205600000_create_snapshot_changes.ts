import type { Knex } from 'knex';

// A snapshot's feed: each registry version at which the effects its request matches changed, compared with the
// snapshot itself. snapshot_watch keeps how far each snapshot was checked and what it last saw.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('snapshot_watch', (t) => {
    t.text('snapshot_id').primary().references('snapshots.id').onDelete('CASCADE');
    t.text('fingerprint').notNullable();
    t.bigInteger('last_version').notNullable();
  });
  await knex.schema.createTable('snapshot_changes', (t) => {
    t.increments('id').primary();
    t.text('snapshot_id').notNullable().references('snapshots.id').onDelete('CASCADE');
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.bigInteger('registry_version').notNullable();
    /** today's result (null when nothing matches any more) */
    t.jsonb('result');
    /** effect ids added, withdrawn and corrected since the snapshot */
    t.jsonb('changes').notNullable();
    /** threshold events against the snapshot's result, at the common-practice defaults */
    t.jsonb('events').notNullable();
    t.index(['snapshot_id', 'id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('snapshot_changes');
  await knex.schema.dropTable('snapshot_watch');
}
