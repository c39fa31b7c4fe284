import type { Knex } from 'knex';

// An undone decision stays in the history table but no longer counts (undone_at set, and by whom).
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.timestamp('undone_at', { useTz: true });
    t.integer('undone_by').references('users.id').onDelete('SET NULL');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('screening_decisions', (t) => {
    t.dropColumn('undone_by');
    t.dropColumn('undone_at');
  });
}
