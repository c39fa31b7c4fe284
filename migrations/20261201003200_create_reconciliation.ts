import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('discrepancies', (t) => {
    t.increments('id').primary();
    t.integer('assignment_id').notNullable().references('assignments.id').onDelete('CASCADE');
    t.text('path').notNullable();
    t.text('field').notNullable();
    t.text('label').notNullable();
    t.jsonb('value_a');
    t.jsonb('value_b');
    t.text('status').notNullable().defaultTo('open');
    t.text('resolution');
    t.jsonb('resolved_value');
    t.text('rationale');
    t.integer('resolved_by').references('users.id').onDelete('SET NULL');
    t.timestamp('resolved_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['assignment_id', 'path']);
  });
  await knex.raw(`ALTER TABLE discrepancies ADD CONSTRAINT discrepancies_status_check CHECK (status IN ('open','resolved'))`);
  await knex.raw(`ALTER TABLE discrepancies ADD CONSTRAINT discrepancies_resolution_check CHECK (resolution IS NULL OR resolution IN ('a','b','value'))`);

  await knex.schema.createTable('settlements', (t) => {
    t.increments('id').primary();
    t.integer('reference_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.integer('assignment_id').references('assignments.id').onDelete('SET NULL');
    t.integer('record_id').notNullable().references('extractions.id').onDelete('CASCADE');
    t.text('kind').notNullable();
    t.integer('actor_id').references('users.id').onDelete('SET NULL');
    t.text('rationale').notNullable().defaultTo('');
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['reference_id']);
  });
  await knex.raw(`ALTER TABLE settlements ADD CONSTRAINT settlements_kind_check CHECK (kind IN ('matched','reconciled','direct','reopened','withdrawn','edited'))`);

  // max(id) is the registry version: it grows in the same transaction as every change to settled data.
  await knex.schema.createTable('registry_changes', (t) => {
    t.bigIncrements('id').primary();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.text('kind').notNullable();
    t.integer('reference_id');
    t.integer('extraction_id');
    t.integer('effect_id');
    t.integer('actor_id');
    t.jsonb('details').notNullable().defaultTo('{}');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('registry_changes');
  await knex.schema.dropTable('settlements');
  await knex.schema.dropTable('discrepancies');
}
