import knexFactory, { type Knex } from 'knex';
import pg from 'pg';

// Return bigint and numeric columns as JS numbers (ids and counts here stay far below 2^53).
pg.types.setTypeParser(20, (v) => Number(v));
pg.types.setTypeParser(1700, (v) => Number(v));

export function createDb(connectionString: string, pool: Knex.PoolConfig = { min: 0, max: 10 }): Knex {
  return knexFactory({ client: 'pg', connection: connectionString, pool });
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
