import type { Knex } from 'knex';

// Import batches with one row per entry, screening decisions (append-only history), PDF attachments and the
// likely-duplicate pairs offered to curators.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('import_batches', (t) => {
    t.increments('id').primary();
    t.text('format').notNullable();
    t.text('label');
    t.text('state').notNullable().defaultTo('running');
    t.integer('total').notNullable().defaultTo(0);
    t.integer('created_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('finished_at', { useTz: true });
  });
  await knex.raw(`ALTER TABLE import_batches ADD CONSTRAINT import_batches_format_check CHECK (format IN ('bibtex','ris','doi'))`);
  await knex.raw(`ALTER TABLE import_batches ADD CONSTRAINT import_batches_state_check CHECK (state IN ('running','done'))`);

  await knex.schema.createTable('import_entries', (t) => {
    t.bigIncrements('id').primary();
    t.integer('batch_id').notNullable().references('import_batches.id').onDelete('CASCADE');
    t.integer('idx').notNullable();
    t.text('entry_key');
    t.text('status').notNullable();
    t.text('message');
    t.text('input');
    t.integer('reference_id').references('refs.id').onDelete('SET NULL');
    t.integer('likely_duplicate_of').references('refs.id').onDelete('SET NULL');
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['batch_id', 'idx']);
    t.index(['reference_id']);
  });
  await knex.raw(`ALTER TABLE import_entries ADD CONSTRAINT import_entries_status_check CHECK (status IN ('pending','imported','duplicate','rejected'))`);

  await knex.schema.createTable('screening_decisions', (t) => {
    t.bigIncrements('id').primary();
    t.integer('ref_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.text('decision').notNullable();
    t.text('reason');
    t.text('note');
    t.integer('decided_by').references('users.id').onDelete('SET NULL');
    t.timestamp('decided_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['ref_id', 'decided_at']);
  });
  await knex.raw(`ALTER TABLE screening_decisions ADD CONSTRAINT screening_decisions_decision_check CHECK (decision IN ('included','excluded'))`);
  await knex.raw(
    `ALTER TABLE screening_decisions ADD CONSTRAINT screening_decisions_reason_check CHECK ((decision = 'included' AND reason IS NULL) OR (decision = 'excluded' AND reason IS NOT NULL))`,
  );

  await knex.schema.createTable('reference_attachments', (t) => {
    t.increments('id').primary();
    t.integer('ref_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.text('filename').notNullable();
    t.text('stored_name').notNullable().unique();
    t.integer('size_bytes').notNullable();
    t.text('mime').notNullable();
    t.integer('uploaded_by').references('users.id').onDelete('SET NULL');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['ref_id']);
  });

  await knex.schema.createTable('ref_duplicate_candidates', (t) => {
    t.increments('id').primary();
    t.integer('ref_a').notNullable().references('refs.id').onDelete('CASCADE');
    t.integer('ref_b').notNullable().references('refs.id').onDelete('CASCADE');
    t.text('reason').notNullable();
    t.text('status').notNullable().defaultTo('open');
    t.integer('decided_by').references('users.id').onDelete('SET NULL');
    t.timestamp('decided_at', { useTz: true });
    t.integer('kept_ref');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['ref_a', 'ref_b']);
    t.index(['status']);
  });
  await knex.raw(`ALTER TABLE ref_duplicate_candidates ADD CONSTRAINT ref_duplicate_candidates_order CHECK (ref_a < ref_b)`);
  await knex.raw(`ALTER TABLE ref_duplicate_candidates ADD CONSTRAINT ref_duplicate_candidates_status_check CHECK (status IN ('open','merged','dismissed'))`);

  // Likely-duplicate lookups go by title key and year; the author check runs on the few rows that share both.
  await knex.raw(`CREATE INDEX refs_live_title_key ON refs (title_key, year) WHERE merged_into IS NULL`);
  await knex.raw(`CREATE INDEX refs_created_at ON refs (created_at)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('DROP INDEX IF EXISTS refs_created_at');
  await knex.raw('DROP INDEX IF EXISTS refs_live_title_key');
  await knex.schema.dropTableIfExists('ref_duplicate_candidates');
  await knex.schema.dropTableIfExists('reference_attachments');
  await knex.schema.dropTableIfExists('screening_decisions');
  await knex.schema.dropTableIfExists('import_entries');
  await knex.schema.dropTableIfExists('import_batches');
}
