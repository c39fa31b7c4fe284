import type { Knex } from 'knex';

// "references" is an SQL keyword, so the table is `refs`; the API and screens say "reference".
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('refs', (t) => {
    t.increments('id').primary();
    t.jsonb('csl').notNullable();
    t.text('doi').unique();
    t.text('title').notNullable();
    t.integer('year');
    t.text('first_author');
    t.text('container');
    t.text('title_key').notNullable();
    t.text('source').notNullable().defaultTo('manual');
    t.text('screening_status').notNullable().defaultTo('unscreened');
    t.integer('merged_into').references('refs.id').onDelete('SET NULL');
    t.integer('version').notNullable().defaultTo(1);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['title_key', 'year']);
    t.index(['year']);
    t.index(['screening_status']);
  });
  await knex.raw(`ALTER TABLE refs ADD CONSTRAINT refs_screening_status_check CHECK (screening_status IN ('unscreened','included','excluded'))`);
  await knex.raw(`ALTER TABLE refs ADD CONSTRAINT refs_doi_normalised CHECK (doi IS NULL OR doi = lower(doi))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('refs');
}
