// Benchmark for issue 10 (Load): `npm run bench -- flood`.
// One signed-out caller floods uncached syntheses over 50,000 SYNTHETIC settled effects (tests/bench/support/
// flooder.ts, its own process) while another reads a reference page (GET /api/references/:id) 20 times a
// second. Target: the reader's p95 under the flood stays within 2× its idle p95, with the server's per-caller
// budget at a realistic size (FLOOD_BUDGET, default 3000 units a minute, the server's default; npm run bench
// otherwise sets it huge). The callers are told apart by address (TRUST_PROXY=1, X-Forwarded-For).
// For contrast the flood is repeated with the budget as npm run bench sets it (BENCH_PARTS=budget skips that).
import { spawn, type ChildProcess } from 'node:child_process';
import { createInterface } from 'node:readline';
import { createDb } from '../../server/db/knex.js';
import { ensureVocabulary } from '../../server/services/manipulations.js';
import { ensureDemoPeople } from '../../seeds/01_demo_people.js';
import { bulkSynthetic, percentile, waitFor } from './support/synthetic.js';

const url = process.env.DATABASE_URL!;
if (!/chronometa_bench/.test(url)) throw new Error('run with npm run bench (it brings up chronometa_bench)');
const origin = process.env.APP_ORIGIN!;
const budget = Number(process.env.FLOOD_BUDGET ?? 3000);
const unlimited = process.env.CALLER_BUDGET_PER_MINUTE ?? '100000000';
const parts = new Set((process.env.BENCH_PARTS ?? 'budget,unlimited').split(',').map((x) => x.trim()));
const READ_EVERY_MS = 50;
const READ_SECONDS = 20;
const db = createDb(url);

let server: ChildProcess | undefined;
let stopping = false;
async function startServer(perMinute: string) {
  stopping = false;
  server = spawn('node_modules/.bin/tsx', ['server/index.ts'], {
    env: { ...process.env, JOBS_ENABLED: 'false', NODE_ENV: 'production', TRUST_PROXY: '1', CALLER_BUDGET_PER_MINUTE: perMinute },
    stdio: ['ignore', 'ignore', 'pipe'],
  });
  let serverErr = '';
  server.stderr!.on('data', (d) => (serverErr += String(d)));
  server.on('exit', (code) => {
    if (code && !stopping) console.error(`server exited with ${code}:\n${serverErr}`);
  });
  await waitFor(`${origin}/api/health`);
}
async function stopServer() {
  if (!server) return;
  stopping = true;
  const s = server;
  server = undefined;
  await new Promise<void>((resolve) => {
    s.once('exit', () => resolve());
    s.kill('SIGTERM');
  });
}

/** The cheap caller: one read every READ_EVERY_MS (or right after the previous, if slower), for `seconds`. */
async function reads(path: string, seconds: number) {
  const times: number[] = [];
  let refused = 0;
  const end = performance.now() + seconds * 1000;
  while (performance.now() < end) {
    const t = performance.now();
    const res = await fetch(`${origin}${path}`, { headers: { 'x-forwarded-for': '198.51.100.7', 'accept-encoding': 'gzip' } });
    await res.arrayBuffer();
    const ms = performance.now() - t;
    if (!res.ok) refused++;
    else times.push(ms);
    const wait = READ_EVERY_MS - ms;
    if (wait > 0) await new Promise((r) => setTimeout(r, wait));
  }
  return { n: times.length, refused, p50: percentile(times, 50), p95: percentile(times, 95) };
}

/** Runs the flooder and, once it has started, the cheap caller; returns both. */
async function flood(path: string) {
  const child = spawn('node_modules/.bin/tsx', ['tests/bench/support/flooder.ts'], {
    env: { ...process.env, FLOOD_SECONDS: String(READ_SECONDS + 2) },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  const lines = createInterface({ input: child.stdout! });
  let summary = '';
  const started = new Promise<void>((resolve) => {
    lines.on('line', (line) => {
      if (line === 'start') resolve();
      else summary = line;
    });
  });
  const done = new Promise<number | null>((resolve) => child.once('exit', resolve));
  await started;
  const read = await reads(path, READ_SECONDS);
  const code = await done;
  if (code) throw new Error(`flooder exited with ${code}`);
  return { read, flooder: JSON.parse(summary) as { total: number; byStatus: Record<string, number>; errors: number; seconds: number } };
}

const fmt = (x: number) => x.toFixed(1);
let failed = false;
try {
  await ensureDemoPeople(db);
  await ensureVocabulary(db);
  const t = performance.now();
  const large = await bulkSynthetic(db, 'synthetic_bench_large', 10_000, 2, [3, 2], 1);
  await db.raw('ANALYZE');
  console.log(`synthetic rows: ${large} effects (synthetic_bench_large), made in ${((performance.now() - t) / 1000).toFixed(1)} s`);
  const ref = await db('refs').where('doi', 'like', '10.5555/synthetic.synthetic_bench_large.%').orderBy('id').first('id');
  const path = `/api/references/${ref.id}`;

  const run = async (label: string, perMinute: string) => {
    await startServer(perMinute);
    try {
      const check = await fetch(`${origin}${path}`);
      if (!check.ok) throw new Error(`${path} answered ${check.status}: ${await check.text()}`);
      await reads(path, 2); // warm the JIT and the pool
      const idle = await reads(path, READ_SECONDS);
      const under = await flood(path);
      const ratio = under.read.p95 / idle.p95;
      const f = under.flooder;
      const statuses = Object.entries(f.byStatus).map(([s, n]) => `${n} × ${s}`).join(', ');
      console.log(`${label} (CALLER_BUDGET_PER_MINUTE=${perMinute}):`);
      console.log(`  GET ${path} idle: p50 ${fmt(idle.p50)} ms, p95 ${fmt(idle.p95)} ms over ${idle.n} reads (${idle.refused} refused)`);
      console.log(`  under the flood: p50 ${fmt(under.read.p50)} ms, p95 ${fmt(under.read.p95)} ms over ${under.read.n} reads (${under.read.refused} refused)`);
      console.log(`  flooder: ${f.total} synthesis requests over 50,000 effects in ${f.seconds} s (${statuses}; ${f.errors} errors/timeouts)`);
      console.log(`  p95 ratio flood/idle ${ratio.toFixed(2)}× (target ≤ 2×: ${ratio <= 2 ? 'met' : 'MISSED'})`);
      return ratio <= 2 && under.read.refused === 0;
    } finally {
      await stopServer();
    }
  };
  if (parts.has('budget') && !(await run('1. flood with a realistic per-caller budget', String(budget)))) failed = true;
  if (parts.has('unlimited')) await run('2. for contrast, the same flood with the budget as npm run bench sets it', unlimited);
} finally {
  await stopServer();
  await db.destroy();
}
if (failed) process.exitCode = 1;
