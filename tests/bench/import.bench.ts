// Benchmark for issue 4: `npm run bench -- import`. Imports 5,000 generated BibTeX entries through
// POST /api/imports (a signed-in contributor, the whole route: parse, duplicate checks, inserts, entry report,
// audit, search indexing through the Meilisearch client to the fake index), then the same file again (every
// entry a duplicate). Target: the first import under 15 s.
import { buildApp } from '../../server/app.js';
import { closeContext, createContext } from '../../server/context.js';
import { readEnv } from '../../server/env.js';
import { fakePortsFromEnv, startFakes } from '../../server/fakes/run.js';
import { ensureDemoPeople } from '../../seeds/01_demo_people.js';
import { signIn } from '../support/test-app.js';

const N = 5000;
const WORDS = ['looming', 'duration', 'interval', 'bisection', 'reproduction', 'auditory', 'visual', 'tactile', 'numerosity', 'oddball', 'simultaneity', 'recalibration', 'chronostasis', 'flash-lag', 'filled', 'empty', 'tempo', 'rhythm', 'saccade', 'attention'];
const FAMILIES = ['Varga', 'Noor', 'Okafor', 'Lindqvist', 'Serrano', 'Haddad', 'Whitcombe', 'Mbeki', 'Castellanos', 'Takahara', 'Ferreira', 'Adeyemi'];

function entries(n: number): string {
  const out: string[] = [];
  for (let i = 0; i < n; i++) {
    const w = (k: number) => WORDS[(i * 7 + k * 13) % WORDS.length];
    const a = FAMILIES[i % FAMILIES.length];
    const b = FAMILIES[(i * 5 + 3) % FAMILIES.length];
    out.push(
      `@article{bench${i},\n  title = {${w(0)} and ${w(1)} in ${w(2)} judgements, study ${i}},\n  author = {${a}, Demo and ${b}, Second},\n  year = {${1980 + (i % 45)}},\n  journal = {Journal of Invented ${w(3)} Research},\n  volume = {${1 + (i % 40)}},\n  pages = {${i % 300}--${(i % 300) + 12}},\n  doi = {10.5555/bench.import.${i}}\n}`,
    );
  }
  return out.join('\n\n');
}

const env = readEnv({ ...process.env, JOBS_ENABLED: 'false' });
const fakes = await startFakes(fakePortsFromEnv());
const ctx = createContext(env);
try {
  await ensureDemoPeople(ctx.db);
  const app = buildApp(ctx);
  const agent = await signIn(app, 'coder1');
  const text = entries(N);
  console.log(`${N} BibTeX entries, ${(text.length / 1024 / 1024).toFixed(2)} MB`);

  let t = performance.now();
  const first = await agent.post('/api/imports').send({ format: 'bibtex', text });
  const firstMs = performance.now() - t;
  if (first.status !== 201 || first.body.batch.counts.imported !== N) throw new Error(`first import: ${first.status} ${JSON.stringify(first.body.batch?.counts ?? first.body)}`);

  t = performance.now();
  const again = await agent.post('/api/imports').send({ format: 'bibtex', text });
  const againMs = performance.now() - t;
  if (again.body.batch.counts.duplicate !== N) throw new Error(`second import: ${JSON.stringify(again.body.batch.counts)}`);

  const indexed = await ctx.search!.count('references');
  console.log(`first import (all new):        ${(firstMs / 1000).toFixed(2)} s  (${((firstMs / N) * 1000).toFixed(0)} µs per entry; ${indexed} documents in the index)`);
  console.log(`second import (all duplicates): ${(againMs / 1000).toFixed(2)} s`);
  console.log(`target < 15 s: ${firstMs < 15_000 ? 'met' : 'MISSED'}`);
  if (firstMs >= 15_000) process.exitCode = 1;
} finally {
  await closeContext(ctx);
  await fakes.stop();
}
