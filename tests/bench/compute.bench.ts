// Benchmark for issue 3's compute route: `npm run bench -- compute`.
// The server runs as its own process (server/index.ts) so autocannon does not share its event loop.
// POST /api/compute/pool with k = 10⁴ heterogeneous effects (DL, full result), one connection at a time for
// 10 s; prints the 50th/95th/99th percentile latency of every response (target: p95 < 20 ms) and the rate.
import { spawn } from 'node:child_process';
import autocannon from 'autocannon';
import { randomEffects } from '../support/random.js';
import { percentile, waitFor } from './support/synthetic.js';

const origin = process.env.APP_ORIGIN ?? `http://127.0.0.1:${process.env.APP_PORT}`;

function body(k: number) {
  const { effects, variances } = randomEffects(12345, k, { mu: 0.3, tau2: 0.08, vmin: 0.005, vmax: 0.305 });
  return JSON.stringify({ effects, variances, method: 'DL' });
}

const server = spawn('node_modules/.bin/tsx', ['server/index.ts'], {
  env: { ...process.env, JOBS_ENABLED: 'false', NODE_ENV: 'production' },
  stdio: ['ignore', 'ignore', 'inherit'],
});
let failed = false;
try {
  await waitFor(`${origin}/api/health`);
  const payload = body(10_000);
  const check = await fetch(`${origin}/api/compute/pool`, { method: 'POST', headers: { 'Content-Type': 'application/json' }, body: payload });
  if (check.status !== 200) throw new Error(`compute route answered ${check.status}: ${await check.text()}`);
  const times: number[] = [];
  const result = await new Promise<autocannon.Result>((resolve, reject) => {
    const instance = autocannon(
      { url: `${origin}/api/compute/pool`, method: 'POST', headers: { 'content-type': 'application/json' }, body: payload, connections: 1, duration: 10 },
      (err, res) => (err ? reject(err) : resolve(res)),
    );
    instance.on('response', (_client: unknown, _status: number, _bytes: number, responseTime: number) => times.push(responseTime));
  });
  const p95 = percentile(times, 95);
  console.log(
    `POST /api/compute/pool, k = 10⁴ (${(payload.length / 1e6).toFixed(2)} MB body), 1 connection, 10 s: ` +
      `${result.requests.total} requests, ${result.non2xx} non-2xx, p50 ${percentile(times, 50).toFixed(1)} ms, ` +
      `p95 ${p95.toFixed(1)} ms, p99 ${percentile(times, 99).toFixed(1)} ms, ${result.requests.average.toFixed(0)} req/s  (target p95 < 20 ms: ${p95 < 20 ? 'met' : 'NOT met'})`,
  );
  if (result.non2xx > 0 || result.errors > 0) failed = true;
} catch (err) {
  console.error(err);
  failed = true;
} finally {
  server.kill('SIGTERM');
}
process.exit(failed ? 1 : 0);
