import request from 'supertest';
import type { Knex } from 'knex';
import { buildApp } from '../../server/app.js';
import { closeContext, createContext, type AppContext } from '../../server/context.js';
import { readEnv } from '../../server/env.js';
import { startWorkers } from '../../server/workers.js';
import { ensureDemoPeople } from '../../seeds/01_demo_people.js';

export interface TestApp {
  app: ReturnType<typeof buildApp>;
  ctx: AppContext;
  close(): Promise<void>;
}

/** An app on the test database, optionally with background workers (pg-boss) running. */
export async function createTestApp(opts: { jobs?: boolean; env?: Record<string, string> } = {}): Promise<TestApp> {
  const env = readEnv({ ...process.env, JOBS_ENABLED: opts.jobs ? 'true' : 'false', ...opts.env });
  const ctx = createContext(env);
  await startWorkers(ctx);
  const app = buildApp(ctx);
  return { app, ctx, close: () => closeContext(ctx) };
}

/** Empties every application table (not the migration bookkeeping) and re-creates the demo people. */
export async function resetDb(db: Knex): Promise<Map<string, number>> {
  const tables: string[] = (
    await db.raw(`SELECT tablename FROM pg_tables WHERE schemaname = 'public' AND tablename NOT LIKE 'knex_migrations%'`)
  ).rows.map((r: { tablename: string }) => `"${r.tablename}"`);
  if (tables.length) await db.raw(`TRUNCATE ${tables.join(', ')} RESTART IDENTITY CASCADE`);
  return ensureDemoPeople(db);
}

export const origin = () => process.env.APP_ORIGIN!;

/** A signed-out client that still sends this site's Origin, as a browser on the page would. */
export function anonymous(app: TestApp['app']) {
  return request.agent(app).set('Origin', origin());
}

/** Signs in through the whole OAuth round trip against the local provider and returns a cookie-carrying agent. */
export async function signIn(app: TestApp['app'] | string, login: string) {
  const agent = request.agent(app);
  const start = await agent.get('/auth/github');
  if (start.status !== 302) throw new Error(`/auth/github answered ${start.status}`);
  const authorize = new URL(start.headers.location);
  authorize.searchParams.set('login', login);
  const provider = await fetch(authorize, { redirect: 'manual' });
  const callback = new URL(provider.headers.get('location') ?? '');
  const done = await agent.get(callback.pathname + callback.search);
  if (done.status !== 302 || done.headers.location?.includes('signin=failed')) {
    throw new Error(`sign-in as ${login} failed: ${done.status} ${done.headers.location}`);
  }
  agent.set('Origin', origin());
  return agent;
}

export type Agent = Awaited<ReturnType<typeof signIn>>;
