import type { Knex } from 'knex';
import pg from 'pg';
import type { Env } from './env.js';
import { createDb } from './db/knex.js';
import { JobQueue } from './jobs/queue.js';
import { createSearchIndex, type SearchIndex } from './search/index.js';

/** Everything a router or worker needs; built once per process (or per test app). */
export interface AppContext {
  env: Env;
  db: Knex;
  jobs: JobQueue;
  /** Connections for the session store (connect-pg-simple). */
  sessionPool: pg.Pool;
  /** The search index (Meilisearch client); null when MEILI_HOST is not configured. */
  search: SearchIndex | null;
}

export function createContext(env: Env): AppContext {
  const db = createDb(env.DATABASE_URL);
  const jobs = new JobQueue(env.DATABASE_URL);
  const sessionPool = new pg.Pool({ connectionString: env.DATABASE_URL, max: 4 });
  const search = createSearchIndex(env.MEILI_HOST, env.MEILI_API_KEY);
  return { env, db, jobs, sessionPool, search };
}

/** Starts background workers (each feature registers its own in server/jobs/workers.ts). */
export async function startBackground(ctx: AppContext): Promise<void> {
  if (ctx.env.JOBS_ENABLED !== 'true') return;
  await ctx.jobs.start();
  const { registerWorkers } = await import('./jobs/workers.js');
  await registerWorkers(ctx);
}

export async function closeContext(ctx: AppContext): Promise<void> {
  await ctx.jobs.stop().catch(() => undefined);
  await ctx.sessionPool.end().catch(() => undefined);
  await ctx.db.destroy();
}
