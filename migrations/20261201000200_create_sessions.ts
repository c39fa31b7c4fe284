import type { Knex } from 'knex';

// The table layout connect-pg-simple expects.
export async function up(knex: Knex): Promise<void> {
  await knex.raw(`
    CREATE TABLE "session" (
      "sid" varchar NOT NULL PRIMARY KEY,
      "sess" json NOT NULL,
      "expire" timestamp(6) NOT NULL
    );
    CREATE INDEX "IDX_session_expire" ON "session" ("expire");
  `);
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('session');
}
