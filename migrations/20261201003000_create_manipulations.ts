import type { Knex } from 'knex';

// Effects point at a manipulation by id; the term is a stable slug, so renaming the label or retiring
// a term never breaks coded effects.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('manipulations', (t) => {
    t.increments('id').primary();
    t.text('term').notNullable().unique();
    t.text('label').notNullable();
    t.text('description').notNullable().defaultTo('');
    t.timestamp('retired_at', { useTz: true });
    t.integer('version').notNullable().defaultTo(1);
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
  });
  await knex.raw(`ALTER TABLE manipulations ADD CONSTRAINT manipulations_term_slug CHECK (term ~ '^[a-z0-9]+(_[a-z0-9]+)*$')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('manipulations');
}
