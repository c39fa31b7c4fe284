import type { Knex } from 'knex';

/**
 * trial_sets: one uploaded file of trials (or per-level counts) on a coding sheet, with the state of its fit
 * job. trial_rows: its rows (a single trial is n = 1, k = response). trial_fits: one fit per participant ×
 * condition. effects.derivation: how an effect was derived from a set's fits ("from trial data").
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('trial_sets', (t) => {
    t.increments('id').primary();
    t.integer('extraction_id').notNullable().references('extractions.id').onDelete('CASCADE');
    t.text('label').notNullable();
    t.text('task').notNullable();
    t.text('model').notNullable().defaultTo('cumulative_gaussian');
    t.text('modality').notNullable();
    t.text('format').notNullable();
    t.text('file_name').notNullable().defaultTo('');
    t.integer('row_count').notNullable();
    t.integer('trial_count').notNullable();
    t.integer('participant_count').notNullable();
    t.jsonb('conditions').notNullable().defaultTo('[]');
    t.double('level_min').notNullable();
    t.double('level_max').notNullable();
    t.integer('uploaded_by').references('users.id').onDelete('SET NULL');
    t.text('fit_state').notNullable().defaultTo('none');
    t.integer('fit_done').notNullable().defaultTo(0);
    t.integer('fit_total').notNullable().defaultTo(0);
    t.integer('fit_resamples');
    t.text('fit_error');
    t.text('fit_job_id');
    t.timestamp('fitted_at', { useTz: true });
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.index(['extraction_id']);
  });
  await knex.raw(`ALTER TABLE trial_sets ADD CONSTRAINT trial_sets_task_check CHECK (task IN ('order','duration','simultaneity'))`);
  await knex.raw(`ALTER TABLE trial_sets ADD CONSTRAINT trial_sets_format_check CHECK (format IN ('trials','counts'))`);
  await knex.raw(`ALTER TABLE trial_sets ADD CONSTRAINT trial_sets_fit_state_check CHECK (fit_state IN ('none','queued','running','done','failed'))`);

  await knex.schema.createTable('trial_rows', (t) => {
    t.bigIncrements('id').primary();
    t.integer('trial_set_id').notNullable().references('trial_sets.id').onDelete('CASCADE');
    t.integer('line').notNullable();
    t.text('participant').notNullable();
    t.text('condition').notNullable();
    t.double('level').notNullable();
    t.integer('n').notNullable();
    t.integer('k').notNullable();
    t.index(['trial_set_id', 'line']);
  });
  await knex.raw(`ALTER TABLE trial_rows ADD CONSTRAINT trial_rows_counts_check CHECK (n >= 1 AND k >= 0 AND k <= n)`);

  await knex.schema.createTable('trial_fits', (t) => {
    t.increments('id').primary();
    t.integer('trial_set_id').notNullable().references('trial_sets.id').onDelete('CASCADE');
    t.integer('position').notNullable();
    t.text('participant').notNullable();
    t.text('condition').notNullable();
    t.boolean('converged').notNullable();
    t.jsonb('result').notNullable();
    t.unique(['trial_set_id', 'participant', 'condition']);
    t.index(['trial_set_id', 'position']);
  });

  await knex.schema.alterTable('effects', (t) => {
    t.jsonb('derivation');
    t.integer('trial_set_id').references('trial_sets.id').onDelete('SET NULL');
    t.index(['trial_set_id']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('effects', (t) => {
    t.dropIndex(['trial_set_id']);
    t.dropColumn('trial_set_id');
    t.dropColumn('derivation');
  });
  await knex.schema.dropTable('trial_fits');
  await knex.schema.dropTable('trial_rows');
  await knex.schema.dropTable('trial_sets');
}
