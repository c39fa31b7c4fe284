import knexFactory, { type Knex } from 'knex';
import pg from 'pg';

// Return bigint and numeric columns as JS numbers (ids and counts here stay far below 2^53).
pg.types.setTypeParser(20, (v) => Number(v));
pg.types.setTypeParser(1700, (v) => Number(v));

// The planner's default random_page_cost (4) assumes spinning disks and makes it scan whole effect tables
// where an index answers in a millisecond; 1.1 is the usual setting for SSD-backed servers.
const afterCreate = (conn: pg.Client, done: (err: Error | null, conn: pg.Client) => void) => {
  conn.query('SET random_page_cost = 1.1', (err) => done(err ?? null, conn));
};

export function createDb(connectionString: string, pool: Knex.PoolConfig = { min: 0, max: 10 }): Knex {
  return knexFactory({ client: 'pg', connection: connectionString, pool: { afterCreate, ...pool } });
}

export const migrationConfig: Knex.MigratorConfig = {
  directory: new URL('../../migrations', import.meta.url).pathname,
  loadExtensions: ['.ts'],
  tableName: 'knex_migrations',
};

export const seedConfig: Knex.SeederConfig = {
  directory: new URL('../../seeds', import.meta.url).pathname,
  loadExtensions: ['.ts'],
};
