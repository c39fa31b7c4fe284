import type { Knex } from 'knex';

// Follows: a user follows a synthesis request; each re-check that crosses a threshold is a follow_event (feed entry).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('follows', (t) => {
    t.increments('id').primary();
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.jsonb('request').notNullable();
    t.text('snapshot_id').references('snapshots.id');
    /** share of the last notified SE the estimate must move by */
    t.double('se_share').notNullable().defaultTo(0.5);
    /** weight share (0–1) a newly added study must exceed */
    t.double('weight_share').notNullable().defaultTo(0.2);
    t.text('unsubscribe_token').notNullable().unique();
    /** the last notified result: k, estimate, CI, tau², per-study weights */
    t.jsonb('last_result');
    t.bigInteger('last_version').notNullable().defaultTo(0);
    t.timestamp('last_mailed_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['user_id']);
  });
  await knex.schema.createTable('follow_events', (t) => {
    t.increments('id').primary();
    t.integer('follow_id').notNullable().references('follows.id').onDelete('CASCADE');
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.bigInteger('registry_version').notNullable();
    t.jsonb('before');
    t.jsonb('after').notNullable();
    t.jsonb('events').notNullable();
    t.index(['follow_id', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('follow_events');
  await knex.schema.dropTable('follows');
}
