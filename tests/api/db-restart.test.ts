import { spawn, type ChildProcess } from 'node:child_process';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createDb } from '../../server/db/knex.js';
import { startPrivatePostgres, type PrivatePostgres } from '../support/private-pg.js';
import { signIn } from '../support/test-app.js';
import { freePorts } from '../support/ports.js';

const WRITES = 1000;
const WRITERS = 4;
const RESTART_AFTER = 250;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

// The real server process (tsx server/index.ts, with its job queue) on a PostgreSQL cluster of its own, which is
// restarted with `pg_ctl restart -m fast` in the middle of 1,000 writes that each retry a 503 until acknowledged.
describe('a PostgreSQL restart under writes', () => {
  let pg: PrivatePostgres;
  let server: ChildProcess;
  let base: string;
  let log = '';

  beforeAll(async () => {
    const [pgPort, appPort] = await freePorts(2);
    pg = await startPrivatePostgres(`restart-${process.pid}`, pgPort);
    const env = { ...process.env, DATABASE_URL: pg.url, PORT: String(appPort), JOBS_ENABLED: 'true', NODE_ENV: 'test' };
    await new Promise<void>((resolve, reject) => {
      const m = spawn('node_modules/.bin/tsx', ['scripts/db.ts', 'migrate'], { env, stdio: 'ignore' });
      m.on('exit', (code) => (code === 0 ? resolve() : reject(new Error(`migrate exited ${code}`))));
    });
    server = spawn('node_modules/.bin/tsx', ['server/index.ts'], { env, stdio: ['ignore', 'pipe', 'pipe'] });
    server.stdout!.on('data', (d) => (log += d));
    server.stderr!.on('data', (d) => (log += d));
    base = `http://127.0.0.1:${appPort}`;
    for (let i = 0; i < 120; i++) {
      const up = await fetch(`${base}/api/health`).then((r) => r.status === 200, () => false);
      if (up) return;
      await sleep(250);
    }
    throw new Error(`the server did not start:\n${log}`);
  }, 120_000);

  afterAll(async () => {
    server?.kill('SIGTERM');
    await pg?.stop();
  }, 60_000);

  it('loses no acknowledged write, keeps running, answers 503 meanwhile and recovers by itself', async () => {
    const agent = await signIn(base, 'coder1');
    const acked = new Map<string, number>();
    const refusals: { at: number; status: number; code: unknown }[] = [];
    const failures: string[] = [];
    const health: { ms: number; status: number }[] = [];
    let next = 0;
    let restart: Promise<void> | null = null;
    let restartError: unknown = null;
    let backUpAt = 0;
    let restarting = false;

    const writer = async () => {
      while (next < WRITES) {
        const name = `restart-write-${next++}`;
        for (let attempt = 0; ; attempt++) {
          if (attempt > 200) {
            failures.push(`${name}: never acknowledged`);
            break;
          }
          const res = await agent.post('/api/tokens').send({ name }).timeout(20_000).then(
            (r) => r,
            (err: Error) => err,
          );
          if (res instanceof Error) {
            failures.push(`${name}: ${res.message}`);
            await sleep(100);
            continue;
          }
          if (res.status === 201) {
            acked.set(name, res.body.id);
            if (acked.size === RESTART_AFTER && !restart) {
              restarting = true;
              restart = pg.restart().then(
                () => {
                  backUpAt = Date.now();
                  restarting = false;
                },
                (err) => {
                  restartError = err;
                  restarting = false;
                },
              );
            }
            break;
          }
          if (res.status === 503) {
            refusals.push({ at: Date.now(), status: res.status, code: res.body?.error?.code });
            await sleep(100);
            continue;
          }
          failures.push(`${name}: ${res.status} ${JSON.stringify(res.body)}`);
          break;
        }
      }
    };
    const prober = async () => {
      while (next < WRITES) {
        if (restarting) {
          const t0 = performance.now();
          const res = await fetch(`${base}/api/health`, { signal: AbortSignal.timeout(10_000) }).catch((err: Error) => err);
          if (res instanceof Error) failures.push(`health: ${res.message}`);
          else {
            await res.body?.cancel();
            health.push({ ms: performance.now() - t0, status: res.status });
          }
        }
        await sleep(100);
      }
    };
    await Promise.all([...Array.from({ length: WRITERS }, writer), prober()]);
    await restart;

    expect(restartError).toBeNull();
    expect(failures, log.slice(-3000)).toEqual([]);
    expect(server.exitCode, 'the server process exited').toBeNull();
    expect(acked.size).toBe(WRITES);
    // The outage was seen and answered with the error shape.
    expect(refusals.length).toBeGreaterThan(0);
    expect(new Set(refusals.map((r) => r.code))).toEqual(new Set(['unavailable']));
    expect(health.length).toBeGreaterThan(0);
    for (const h of health) {
      expect(h.ms).toBeLessThan(2000);
      expect([200, 503]).toContain(h.status);
    }
    // Recovered by itself: no refusal later than 10 s after PostgreSQL was back.
    const lastRefusal = Math.max(...refusals.map((r) => r.at));
    expect(lastRefusal - backUpAt).toBeLessThan(10_000);

    // Every acknowledged write is in the database.
    const db = createDb(pg.url);
    try {
      const rows: { id: number; name: string }[] = await db('api_tokens').whereIn('name', [...acked.keys()]).select('id', 'name');
      const stored = new Map(rows.map((r) => [r.id, r.name]));
      const lost = [...acked].filter(([name, id]) => stored.get(id) !== name);
      expect(lost).toEqual([]);
    } finally {
      await db.destroy();
    }
    const after = await request(base).get('/api/health');
    expect(after.status).toBe(200);
    console.log(`restart under writes: ${refusals.length} answers 503, slowest health ${Math.max(...health.map((h) => h.ms)).toFixed(0)} ms, last 503 ${lastRefusal - backUpAt} ms after PostgreSQL was back`);
  }, 180_000);
});
