import type { Knex } from 'knex';

// Large BibTeX/RIS imports run as a job: the batch keeps the submitted text until done, how many entries the job has
// read (processed), and why it failed in words. States gain queued (waiting for the job) and failed.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('import_batches', (t) => {
    t.text('source_text');
    t.integer('processed');
    t.text('failure');
  });
  await knex.raw('ALTER TABLE import_batches DROP CONSTRAINT import_batches_state_check');
  await knex.raw(`ALTER TABLE import_batches ADD CONSTRAINT import_batches_state_check CHECK (state IN ('queued','running','done','failed'))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.transaction(async (trx) => {
    // the old states cannot say queued or failed: a failed batch ends done with what it imported, a queued one running
    await trx('import_batches').where({ state: 'failed' }).update({ state: 'done', finished_at: trx.raw('coalesce(finished_at, now())') });
    await trx('import_batches').where({ state: 'queued' }).update({ state: 'running' });
    await trx.raw('ALTER TABLE import_batches DROP CONSTRAINT import_batches_state_check');
    await trx.raw(`ALTER TABLE import_batches ADD CONSTRAINT import_batches_state_check CHECK (state IN ('running','done'))`);
    await trx.schema.alterTable('import_batches', (t) => {
      t.dropColumn('source_text');
      t.dropColumn('processed');
      t.dropColumn('failure');
    });
  });
}
