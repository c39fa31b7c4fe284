import type { Knex } from 'knex';

/**
 * studies: the stable identity of one experiment of a reference (kept across reopened versions, so
 * analyses can group dependent effects by it). extraction_studies: one coder's (or the settled record's)
 * coding of a study. extractions: one coder's coding of one reference, or a version of its settled record.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('assignments', (t) => {
    t.increments('id').primary();
    t.integer('reference_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.integer('coder1_id').notNullable().references('users.id');
    t.integer('coder2_id').notNullable().references('users.id');
    t.integer('assigned_by').references('users.id').onDelete('SET NULL');
    t.text('state').notNullable().defaultTo('coding');
    t.integer('version').notNullable().defaultTo(1);
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['reference_id']);
    t.index(['state']);
  });
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_state_check CHECK (state IN ('coding','matched','disputed','settled','withdrawn'))`);
  await knex.raw(`ALTER TABLE assignments ADD CONSTRAINT assignments_two_coders CHECK (coder1_id <> coder2_id)`);

  await knex.schema.createTable('extractions', (t) => {
    t.increments('id').primary();
    t.integer('reference_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.integer('assignment_id').references('assignments.id').onDelete('SET NULL');
    t.text('kind').notNullable().defaultTo('coding');
    t.integer('coder_id').references('users.id').onDelete('SET NULL');
    t.text('state').notNullable().defaultTo('draft');
    t.integer('version').notNullable().defaultTo(1);
    t.integer('record_version');
    t.integer('supersedes_id').references('extractions.id').onDelete('SET NULL');
    t.integer('superseded_by').references('extractions.id').onDelete('SET NULL');
    t.text('reopen_reason');
    t.text('notes').notNullable().defaultTo('');
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('submitted_at', { useTz: true });
    t.timestamp('settled_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['reference_id', 'kind', 'state']);
    t.index(['coder_id', 'state']);
    t.index(['assignment_id']);
  });
  await knex.raw(`ALTER TABLE extractions ADD CONSTRAINT extractions_kind_check CHECK (kind IN ('coding','settled'))`);
  await knex.raw(
    `ALTER TABLE extractions ADD CONSTRAINT extractions_state_check CHECK (state IN ('draft','submitted','matched','disputed','settled','withdrawn'))`,
  );

  await knex.schema.createTable('studies', (t) => {
    t.increments('id').primary();
    t.integer('reference_id').notNullable().references('refs.id').onDelete('CASCADE');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['reference_id']);
  });

  await knex.schema.createTable('extraction_studies', (t) => {
    t.increments('id').primary();
    t.integer('extraction_id').notNullable().references('extractions.id').onDelete('CASCADE');
    t.integer('study_id').references('studies.id').onDelete('SET NULL');
    t.integer('position').notNullable();
    t.text('label').notNullable().defaultTo('');
    t.text('design');
    t.integer('n1');
    t.integer('n2');
    t.text('population');
    t.text('diagnosis');
    t.text('modality');
    t.text('task');
    t.double('standard_ms');
    t.unique(['extraction_id', 'position']);
    t.index(['study_id']);
  });

  await knex.schema.createTable('effects', (t) => {
    t.increments('id').primary();
    t.integer('extraction_id').notNullable().references('extractions.id').onDelete('CASCADE');
    t.integer('extraction_study_id').notNullable().references('extraction_studies.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.text('label').notNullable().defaultTo('');
    t.text('outcome');
    t.integer('manipulation_id').references('manipulations.id');
    t.text('report_form');
    t.jsonb('reported').notNullable().defaultTo('{}');
    t.text('metric');
    t.double('effect');
    t.double('variance');
    t.text('formula');
    t.double('assumed_r');
    t.integer('n_total');
    t.text('page');
    t.text('locator');
    t.text('quote');
    t.integer('version').notNullable().defaultTo(1);
    t.integer('updated_by').references('users.id').onDelete('SET NULL');
    t.timestamp('withdrawn_at', { useTz: true });
    t.text('withdrawn_reason');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('updated_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.unique(['extraction_study_id', 'position']);
    t.index(['extraction_id']);
    t.index(['manipulation_id', 'outcome']);
  });
  await knex.raw(`ALTER TABLE effects ADD CONSTRAINT effects_variance_positive CHECK (variance IS NULL OR variance > 0)`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('effects');
  await knex.schema.dropTable('extraction_studies');
  await knex.schema.dropTable('studies');
  await knex.schema.dropTable('extractions');
  await knex.schema.dropTable('assignments');
}
