import type { Knex } from 'knex';

// At most one active pair (coding or disputed) per reference, whatever the application does under concurrency.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`create unique index assignments_one_active_per_reference on assignments (reference_id) where state in ('coding', 'disputed')`);
}

export async function down(knex: Knex): Promise<void> {
  await knex.raw('drop index if exists assignments_one_active_per_reference');
}
