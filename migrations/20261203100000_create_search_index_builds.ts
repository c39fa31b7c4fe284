import type { Knex } from 'knex';

// Which build of each search index the database expects: the index holds the same build id in a marker, so a
// restarted (empty) or stale search server is recognised and re-filled from PostgreSQL.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('search_index_builds', (t) => {
    t.text('index_uid').primary();
    t.text('build');
    t.integer('document_schema').notNullable();
    t.integer('documents').notNullable().defaultTo(0);
    t.timestamp('built_at', { useTz: true });
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('search_index_builds');
}
