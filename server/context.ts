import pg from 'pg';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import type { Env } from './env.js';
import { CONNECT_TIMEOUT_MS, createDb } from './db/knex.js';
import { createDoiResolver } from './adapters/citations.js';
import { JobQueue } from './adapters/jobs.js';
import { createMailer } from './adapters/mail.js';
import { createSearchIndex } from './adapters/search.js';
import type { Deps } from './services/deps.js';
import { searchWorkSettled } from './services/search.js';

/** The composition root's object: configuration and every adapter, built once per process (or per test app). */
export interface AppContext extends Deps {
  env: Env;
  /** Connections for the session store (connect-pg-simple). */
  sessionPool: pg.Pool;
  /** The session store on that pool; closing it stops its prune timer. */
  sessionStore: InstanceType<ReturnType<typeof connectPgSimple>>;
}

/** The session store's connections; an idle connection dropped by a PostgreSQL restart is logged and replaced. */
function createSessionPool(connectionString: string): pg.Pool {
  const pool = new pg.Pool({ connectionString, max: 4, connectionTimeoutMillis: CONNECT_TIMEOUT_MS });
  pool.on('error', (err) => console.error('[sessions] idle connection lost:', err.message));
  return pool;
}

/** Expired session rows are deleted this often (connect-pg-simple's pruning), or never (false). */
export function sessionPruneSeconds(env: Pick<Env, 'NODE_ENV' | 'SESSION_PRUNE_SECONDS'>): number | false {
  const seconds = env.SESSION_PRUNE_SECONDS ?? (env.NODE_ENV === 'test' ? 0 : 15 * 60);
  return seconds > 0 ? seconds : false;
}

export function createContext(env: Env): AppContext {
  const sessionPool = createSessionPool(env.DATABASE_URL);
  const PgStore = connectPgSimple(session);
  return {
    env,
    db: createDb(env.DATABASE_URL),
    jobs: env.JOBS_ENABLED === 'true' ? new JobQueue(env.DATABASE_URL) : null,
    sessionPool,
    sessionStore: new PgStore({ pool: sessionPool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: sessionPruneSeconds(env), errorLog: (...args: unknown[]) => console.error('[sessions]', ...args) }),
    search: createSearchIndex(env.MEILI_HOST, env.MEILI_API_KEY),
    mailer: createMailer(env),
    doi: createDoiResolver({ baseUrl: env.DOI_RESOLVER_URL, timeoutMs: env.DOI_TIMEOUT_MS }),
    appOrigin: env.APP_ORIGIN,
  };
}

/** Closing lets a running index rebuild end first (at most this long), so it never reads from a closed pool. */
const SEARCH_WORK_WAIT_MS = 15_000;

export async function closeContext(ctx: AppContext): Promise<void> {
  await ctx.jobs?.stop().catch(() => undefined);
  let timer: NodeJS.Timeout | undefined;
  await Promise.race([searchWorkSettled(ctx.search), new Promise<void>((r) => (timer = setTimeout(r, SEARCH_WORK_WAIT_MS)))]);
  clearTimeout(timer);
  await ctx.sessionStore.close();
  await ctx.sessionPool.end().catch(() => undefined);
  await ctx.db.destroy();
}
