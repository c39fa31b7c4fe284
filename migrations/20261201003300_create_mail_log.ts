import type { Knex } from 'knex';

// Every mail the app asks to send, with its delivery state, so admins can see failed sends and retries.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_log', (t) => {
    t.bigIncrements('id').primary();
    t.text('kind').notNullable();
    t.text('to_address').notNullable();
    t.text('subject').notNullable();
    t.text('body').notNullable();
    t.text('status').notNullable().defaultTo('queued');
    t.integer('attempts').notNullable().defaultTo(0);
    t.text('last_error');
    t.text('job_id');
    t.text('message_id');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('sent_at', { useTz: true });
    t.index(['status']);
  });
  await knex.raw(`ALTER TABLE mail_log ADD CONSTRAINT mail_log_status_check CHECK (status IN ('queued','sent','retrying','failed'))`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('mail_log');
}
