// Benchmarks for issue 6: `npm run bench -- synthesis`.
// Rows are SYNTHETIC (bulk-made here, under the manipulation terms synthetic_bench_large / synthetic_bench_small,
// DOIs 10.5555/synthetic.*), never part of the demo seeds. The server runs as its own process (server/index.ts)
// so autocannon does not share its event loop.
//   1. POST /api/syntheses over 50,000 settled effects (20,000 studies): p95 < 300 ms (sequential requests),
//      computed each time and repeated (the answer is kept per registry version).
//   1c. the same 50,000 effects under the three-level model with CR2 robust variance (issue 14), computed each
//      time: p95 < 500 ms.
//   2. GET /api/atlas/manipulations/:term/pooled: 2,000 req/s for 30 s with no errors (cached by registry version).
//   3. POST /api/syntheses over ~200 effects, uncached: 300 req/s.
// BENCH_PARTS=1c (a comma list of 1, 1c, 2, 3) runs only those parts; BENCH_PROFILE_DIR keeps the server's CPU
// profile, BENCH_SERVER_FLAGS adds node flags to the server (e.g. --trace-gc, shown with BENCH_SERVER_OUT=1),
// BENCH_VERBOSE prints every request's time.
import { spawn } from 'node:child_process';
import autocannon from 'autocannon';
import { createDb } from '../../server/db/knex.js';
import { ensureVocabulary } from '../../server/services/manipulations.js';
import { ensureDemoPeople } from '../../seeds/01_demo_people.js';
import { bulkSynthetic, percentile, waitFor } from './support/synthetic.js';

const url = process.env.DATABASE_URL!;
if (!/chronometa_bench/.test(url)) throw new Error('run with npm run bench (it brings up chronometa_bench)');
const origin = process.env.APP_ORIGIN!;
const db = createDb(url);
const parts = new Set((process.env.BENCH_PARTS ?? '1,1c,2,3').split(',').map((x) => x.trim()));

const cannon = (opts: autocannon.Options) =>
  new Promise<autocannon.Result>((resolve, reject) => {
    autocannon(opts, (err, res) => (err ? reject(err) : resolve(res)));
  });

let server: ReturnType<typeof spawn> | undefined;
let stopping = false;
let failed = false;
try {
  await ensureDemoPeople(db);
  await ensureVocabulary(db);
  let t = performance.now();
  const large = await bulkSynthetic(db, 'synthetic_bench_large', 10_000, 2, [3, 2], 1);
  const small = await bulkSynthetic(db, 'synthetic_bench_small', 50, 2, [2], 2);
  await db.raw('ANALYZE'); // fresh statistics after the bulk load, as autovacuum would give a live database
  console.log(`synthetic rows: ${large} effects (large), ${small} effects (small), made in ${((performance.now() - t) / 1000).toFixed(1)} s`);

  // BENCH_PROFILE_DIR=/some/dir writes the server's CPU profile there when the bench ends.
  const profile = process.env.BENCH_PROFILE_DIR ? ['--cpu-prof', `--cpu-prof-dir=${process.env.BENCH_PROFILE_DIR}`] : [];
  server = spawn(process.execPath, [...profile, ...(process.env.BENCH_SERVER_FLAGS?.split(' ').filter(Boolean) ?? []), '--import', 'tsx', 'server/index.ts'], { env: { ...process.env, JOBS_ENABLED: 'false', NODE_ENV: 'production' }, stdio: ['ignore', process.env.BENCH_SERVER_OUT ? 'inherit' : 'ignore', 'pipe'] });
  let serverErr = '';
  server.stderr!.on('data', (d) => (serverErr += String(d)));
  server.on('exit', (code) => {
    if (code && !stopping) console.error(`server exited with ${code}:\n${serverErr}`);
  });
  await waitFor(`${origin}/api/health`);

  const body = (term: string, dependence: Record<string, unknown> = { mode: 'aggregate', r: 0.5 }) =>
    JSON.stringify({ filters: { manipulation: term, metric: 'g_s' }, method: 'DL', hksj: false, dependence });

  // 1. large synthesis, sequential; "computed" requests vary the level so none is answered from the
  // registry-version cache, "repeated" ones send one request again and again (what a page or script does).
  const timed = async (levelFor: (i: number) => number, dependence?: Record<string, unknown>) => {
    const times: number[] = [];
    let studies = 0;
    let hits = 0;
    for (let i = 0; i < 33; i++) {
      t = performance.now();
      const payload = JSON.stringify({ ...JSON.parse(body('synthetic_bench_large', dependence)), level: levelFor(i) });
      const res = await fetch(`${origin}/api/syntheses`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: payload });
      const json = (await res.json()) as { result?: { k: number } };
      if (!res.ok) throw new Error(`synthesis answered ${res.status}: ${JSON.stringify(json).slice(0, 300)}`);
      if (i >= 3) {
        times.push(performance.now() - t); // the first three warm the JIT and the pool
        if (res.headers.get('x-synthesis-cache') === 'hit') hits++;
      }
      studies = json.result!.k;
    }
    if (process.env.BENCH_VERBOSE) console.log(`    times (ms): ${times.map((x) => x.toFixed(0)).join(' ')}`);
    return { p50: percentile(times, 50), p95: percentile(times, 95), n: times.length, studies, hits };
  };
  if (parts.has('1')) {
    const computed = await timed((i) => 0.9 + i / 1000);
    const repeated = await timed(() => 0.95);
    console.log(
      `1a. synthesis over ${large} effects (${computed.studies} studies after aggregation), computed each time: p50 ${computed.p50.toFixed(0)} ms, p95 ${computed.p95.toFixed(0)} ms over ${computed.n} requests (${computed.hits} cache hits)`,
    );
    console.log(
      `1b. the same synthesis repeated (answered from the registry-version cache after the first): p50 ${repeated.p50.toFixed(0)} ms, p95 ${repeated.p95.toFixed(0)} ms over ${repeated.n} requests (${repeated.hits} cache hits)`,
    );
    console.log(`    target p95 < 300 ms: computed ${computed.p95 < 300 ? 'met' : 'MISSED'}, repeated ${repeated.p95 < 300 ? 'met' : 'MISSED'}`);
    if (repeated.p95 >= 300) failed = true;
  }
  if (parts.has('1c')) {
    const multilevel = await timed((i) => 0.9 + i / 1000, { mode: 'multilevel', robust: true });
    console.log(
      `1c. three-level synthesis (CR2 robust) over ${large} effects (${multilevel.studies} effects in the model), computed each time: p50 ${multilevel.p50.toFixed(0)} ms, p95 ${multilevel.p95.toFixed(0)} ms over ${multilevel.n} requests (${multilevel.hits} cache hits); target p95 < 500 ms: ${multilevel.p95 < 500 ? 'met' : 'MISSED'}`,
    );
    if (multilevel.p95 >= 500) failed = true;
  }

  // 2. atlas pooled estimate, cached by registry version
  if (parts.has('2')) {
    const atlas = await cannon({ url: `${origin}/api/atlas/manipulations/synthetic_bench_small/pooled`, connections: 32, pipelining: 1, duration: 30 });
    const atlasErrors = atlas.errors + atlas.timeouts + atlas.non2xx;
    console.log(
      `2. atlas pooled estimate: ${atlas.requests.average.toFixed(0)} req/s average (min ${atlas.requests.min}/s), ${atlas.requests.total} requests in 30 s, latency p99 ${atlas.latency.p99} ms, errors ${atlasErrors} (target 2,000/s, no errors: ${atlas.requests.average >= 2000 && atlasErrors === 0 ? 'met' : 'MISSED'})`,
    );
    if (atlas.requests.average < 2000 || atlasErrors) failed = true;
  }

  // 3. uncached synthesis over ~200 effects
  if (parts.has('3')) {
    // every request a different confidence level, so none is answered from the cache
    let seq = 0;
    const smallBody = JSON.parse(body('synthetic_bench_small'));
    const synth = await cannon({
      url: `${origin}/api/syntheses`,
      connections: 16,
      duration: 20,
      requests: [
        {
          method: 'POST',
          headers: { 'content-type': 'application/json' },
          setupRequest: (r) => ({ ...r, body: JSON.stringify({ ...smallBody, level: 0.9 + ((seq++ % 90000) + 1) / 1e6 }) }),
        },
      ],
    });
    const synthErrors = synth.errors + synth.timeouts + synth.non2xx;
    console.log(
      `3. uncached synthesis over ${small} effects: ${synth.requests.average.toFixed(0)} req/s average (min ${synth.requests.min}/s), latency p50 ${synth.latency.p50} ms, p99 ${synth.latency.p99} ms, ${(synth.throughput.total / synth.requests.total / 1024).toFixed(0)} kB an answer, errors ${synthErrors} (target 300/s: ${synth.requests.average >= 300 && synthErrors === 0 ? 'met' : 'MISSED'})`,
    );
    if (synth.requests.average < 300 || synthErrors) failed = true;
  }
} finally {
  stopping = true;
  server?.kill('SIGTERM');
  await db.destroy();
}
if (failed) process.exitCode = 1;
