import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('audit_log', (t) => {
    t.bigIncrements('id').primary();
    t.timestamp('at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.integer('actor_id').references('users.id').onDelete('SET NULL');
    t.text('action').notNullable();
    t.text('entity_type').notNullable();
    t.text('entity_id');
    t.jsonb('details').notNullable().defaultTo('{}');
    t.index(['entity_type', 'entity_id']);
    t.index(['at']);
  });
  // Append-only: the database itself refuses to change or remove an entry.
  await knex.raw(`
    CREATE FUNCTION audit_log_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'audit_log is append-only';
    END $$;
    CREATE TRIGGER audit_log_append_only BEFORE UPDATE OR DELETE ON audit_log
      FOR EACH ROW EXECUTE FUNCTION audit_log_refuse_change();
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('audit_log');
  await knex.raw('DROP FUNCTION IF EXISTS audit_log_refuse_change()');
}
