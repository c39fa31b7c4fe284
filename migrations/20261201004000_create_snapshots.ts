import type { Knex } from 'knex';

// A snapshot freezes a synthesis: filters, options, the exact effect rows, results, figures, registry version.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('snapshots', (t) => {
    t.text('id').primary();
    t.text('title').notNullable();
    t.integer('created_by').references('users.id');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.bigInteger('registry_version').notNullable();
    t.jsonb('request').notNullable();
    t.text('metric').notNullable();
    t.integer('k').notNullable();
    t.double('estimate').notNullable();
    /** the settled effects as they were, before dependence handling */
    t.jsonb('effects').notNullable();
    /** the synthesis output: pooled rows, results, figures, cautions */
    t.jsonb('output').notNullable();
    t.text('methods').notNullable();
    /** the included references' CSL-JSON, for the BibTeX export */
    t.jsonb('references').notNullable();
    t.jsonb('prisma');
    t.text('software').notNullable();
    t.index(['created_at']);
    t.index(['created_by']);
  });
  // Immutable: the database itself refuses to change or remove a snapshot.
  await knex.raw(`
    CREATE FUNCTION snapshots_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION 'snapshots are immutable';
    END $$;
    CREATE TRIGGER snapshots_immutable BEFORE UPDATE OR DELETE ON snapshots
      FOR EACH ROW EXECUTE FUNCTION snapshots_refuse_change();
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('snapshots');
  await knex.raw('DROP FUNCTION IF EXISTS snapshots_refuse_change()');
}
