// Benchmark for issue 4: `npm run bench -- search`. Puts 20,000 generated references in PostgreSQL, builds the
// index through the Meilisearch client into the fake index (in this process, on loopback), then times 1,000
// searches of a mixed workload (one word, two words, a prefix, an author, with year/status filters, and
// placeholder searches with a filter), every one asking for facet counts as the search screen does.
// Measured per call of searchReferences (client → HTTP → fake index → answer), after 100 warm-up calls.
// Target: p95 under 50 ms.
import { closeContext, createContext } from '../../server/context.js';
import { readEnv } from '../../server/env.js';
import { fakePortsFromEnv, startFakes } from '../../server/fakes/run.js';
import { refColumns } from '../../server/services/reference-fields.js';
import { rebuildReferenceIndex, searchReferences } from '../../server/services/search.js';
import { mulberry32 } from '../support/random.js';
import type { SearchQuery } from '../../shared/schemas/references.js';

const N = 20_000;
const WORDS = ['looming', 'duration', 'interval', 'bisection', 'reproduction', 'auditory', 'visual', 'tactile', 'numerosity', 'oddball', 'simultaneity', 'recalibration', 'chronostasis', 'flash', 'filled', 'empty', 'tempo', 'rhythm', 'saccade', 'attention', 'expansion', 'brightness', 'motion', 'adaptation', 'children', 'ageing', 'clinical', 'stimulus', 'window', 'order'];
const FAMILIES = ['Varga', 'Noor', 'Okafor', 'Lindqvist', 'Serrano', 'Haddad', 'Whitcombe', 'Mbeki', 'Castellanos', 'Takahara', 'Ferreira', 'Adeyemi', 'Brandt', 'Kowalczyk', 'Oyelaran', 'Fujimori', 'Delacroix', 'Anand'];
const STATUSES = ['unscreened', 'included', 'excluded'] as const;

const env = readEnv({ ...process.env, JOBS_ENABLED: 'false' });
const fakes = await startFakes(fakePortsFromEnv());
const ctx = createContext(env);
try {
  const rnd = mulberry32(42);
  const pick = <T,>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  let t = performance.now();
  await ctx.db('refs').del();
  const rows = [];
  for (let i = 0; i < N; i++) {
    const csl = {
      type: 'article-journal',
      title: `${pick(WORDS)} ${pick(WORDS)} and ${pick(WORDS)} in ${pick(WORDS)} judgements (${i})`,
      author: [{ family: pick(FAMILIES), given: 'Demo' }, { family: pick(FAMILIES), given: 'Second' }],
      issued: { 'date-parts': [[1970 + Math.floor(rnd() * 55)]] },
      'container-title': `Journal of Invented ${pick(WORDS)} Studies`,
      DOI: `10.5555/bench.search.${i}`,
    };
    rows.push({ csl: JSON.stringify(csl), ...refColumns(csl), source: 'seed', screening_status: pick(STATUSES) });
  }
  for (let i = 0; i < rows.length; i += 2000) await ctx.db('refs').insert(rows.slice(i, i + 2000));
  const inserted = performance.now() - t;
  t = performance.now();
  const n = await rebuildReferenceIndex(ctx.db, ctx.search!);
  const built = performance.now() - t;
  console.log(`${N} references: inserted in ${(inserted / 1000).toFixed(1)} s, indexed ${n} through the client in ${(built / 1000).toFixed(1)} s`);

  const queries: Array<Partial<SearchQuery>> = [];
  for (let i = 0; i < 1100; i++) {
    const kind = i % 6;
    const y = 1970 + Math.floor(rnd() * 40);
    if (kind === 0) queries.push({ q: pick(WORDS) });
    else if (kind === 1) queries.push({ q: `${pick(WORDS)} ${pick(WORDS)}` });
    else if (kind === 2) queries.push({ q: pick(WORDS).slice(0, 4) });
    else if (kind === 3) queries.push({ q: pick(FAMILIES).toLowerCase() });
    else if (kind === 4) queries.push({ q: pick(WORDS), yearFrom: y, yearTo: y + 10, status: pick(STATUSES) });
    else queries.push({ q: '', status: pick(STATUSES), yearFrom: y });
  }
  const times: number[] = [];
  const serverMs: number[] = [];
  const byKind: number[][] = [[], [], [], [], [], []];
  let hits = 0;
  for (let i = 0; i < queries.length; i++) {
    const s = performance.now();
    const res = await searchReferences(ctx, { limit: 20, offset: 0, q: '', ...queries[i] } as SearchQuery);
    const ms = performance.now() - s;
    if (i >= 100) {
      times.push(ms);
      serverMs.push(res.processingTimeMs ?? 0);
      byKind[i % 6].push(ms);
      hits += res.total;
    }
  }
  times.sort((a, b) => a - b);
  const q = (p: number) => times[Math.min(times.length - 1, Math.floor(p * times.length))];
  console.log(`${times.length} searches (facets on), mean ${(hits / times.length).toFixed(0)} matches each`);
  console.log(`p50 ${q(0.5).toFixed(1)} ms · p95 ${q(0.95).toFixed(1)} ms · p99 ${q(0.99).toFixed(1)} ms · max ${times[times.length - 1].toFixed(1)} ms`);
  serverMs.sort((a, b) => a - b);
  console.log(`inside the fake index: p50 ${serverMs[Math.floor(serverMs.length / 2)]} ms · p95 ${serverMs[Math.floor(serverMs.length * 0.95)]} ms`);
  const kinds = ['one word', 'two words', 'prefix', 'author', 'word + filters', 'filters only'];
  for (const [k, xs] of byKind.entries()) {
    xs.sort((a, b) => a - b);
    console.log(`  ${kinds[k].padEnd(15)} p50 ${xs[Math.floor(xs.length / 2)].toFixed(1)} ms · p95 ${xs[Math.floor(xs.length * 0.95)].toFixed(1)} ms`);
  }
  console.log(`target p95 < 50 ms: ${q(0.95) < 50 ? 'met' : 'MISSED'}`);
  if (q(0.95) >= 50) process.exitCode = 1;
} finally {
  await closeContext(ctx);
  await fakes.stop();
}
