// The flooding caller of tests/bench/flood.bench.ts, in its own process so its client work does not delay the
// cheap caller's timings: POST /api/syntheses over synthetic_bench_large, every request a different level (so
// none is answered from the cache), from one address (X-Forwarded-For), as fast as `FLOOD_CONNECTIONS` allow.
// Prints one JSON line: requests by status and the 2xx rate.
import autocannon from 'autocannon';

const origin = process.env.APP_ORIGIN!;
const seconds = Number(process.env.FLOOD_SECONDS ?? 25);
const connections = Number(process.env.FLOOD_CONNECTIONS ?? 8);
const address = process.env.FLOOD_ADDRESS ?? '198.51.100.66';
const base = { filters: { manipulation: 'synthetic_bench_large', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
let seq = 0;
const byStatus: Record<string, number> = {};
console.log('start');
const result = await new Promise<autocannon.Result>((resolve, reject) => {
  const instance = autocannon(
    {
      url: `${origin}/api/syntheses`,
      connections,
      duration: seconds,
      requests: [
        {
          method: 'POST',
          headers: { 'content-type': 'application/json', 'x-forwarded-for': address },
          setupRequest: (r) => ({ ...r, body: JSON.stringify({ ...base, level: 0.9 + ((seq++ % 90000) + 1) / 1e6 }) }),
        },
      ],
    },
    (err, res) => (err ? reject(err) : resolve(res)),
  );
  instance.on('response', (_client: unknown, status: number) => (byStatus[status] = (byStatus[status] ?? 0) + 1));
});
console.log(JSON.stringify({ total: result.requests.total, byStatus, errors: result.errors + result.timeouts, seconds }));
