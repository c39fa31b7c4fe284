import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.increments('id').primary();
    t.text('github_id').notNullable().unique();
    t.text('login').notNullable().unique();
    t.text('name');
    t.text('email');
    t.text('avatar_url');
    t.timestamp('created_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.timestamp('last_seen_at', { useTz: true });
  });
  await knex.schema.createTable('user_roles', (t) => {
    t.integer('user_id').notNullable().references('users.id').onDelete('CASCADE');
    t.text('role').notNullable();
    t.integer('granted_by').references('users.id').onDelete('SET NULL');
    t.timestamp('granted_at', { useTz: true }).notNullable().defaultTo(knex.fn.now());
    t.primary(['user_id', 'role']);
  });
  await knex.raw(
    `ALTER TABLE user_roles ADD CONSTRAINT user_roles_role_check CHECK (role IN ('reader','contributor','curator','reviewer','admin'))`,
  );
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('user_roles');
  await knex.schema.dropTable('users');
}
