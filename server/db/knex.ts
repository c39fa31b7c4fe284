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

/** A refused or hung connection fails within this many milliseconds (the request then answers 503). */
export const CONNECT_TIMEOUT_MS = 5000;

export function createDb(connectionString: string, pool: Knex.PoolConfig = { min: 0, max: 10 }): Knex {
  // knex marks a connection that reports an error (a PostgreSQL restart ends every connection) as disposed and
  // replaces it; a failed connect is passed to the waiting query at once instead of being retried for a minute.
  return knexFactory({
    client: 'pg',
    connection: { connectionString, connectionTimeoutMillis: CONNECT_TIMEOUT_MS },
    acquireConnectionTimeout: 2 * CONNECT_TIMEOUT_MS,
    pool: { afterCreate, propagateCreateError: true, ...pool },
  });
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
