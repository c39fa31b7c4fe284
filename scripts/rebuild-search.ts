// npm run search:rebuild — empties the references index and fills it again from PostgreSQL.
import { createDb } from '../server/db/knex.js';
import { readEnv } from '../server/env.js';
import { createSearchIndex } from '../server/adapters/search.js';
import { rebuildReferenceIndex } from '../server/services/search.js';

let env;
try {
  env = readEnv();
} catch (err) {
  console.error((err as Error).message);
  process.exit(1);
}
const search = createSearchIndex(env.MEILI_HOST, env.MEILI_API_KEY);
if (!search) {
  console.error('MEILI_HOST is not set: there is no search server to rebuild.');
  process.exit(1);
}
const db = createDb(env.DATABASE_URL);
const started = performance.now();
try {
  const n = await rebuildReferenceIndex(db, search, (done, total) => process.stdout.write(`\rIndexed ${done} of ${total} references`));
  console.log(`\nRebuilt the references index: ${n} references in ${((performance.now() - started) / 1000).toFixed(1)} s.`);
} catch (err) {
  console.error(`\nThe rebuild failed: ${(err as Error).message}`);
  process.exitCode = 1;
} finally {
  await db.destroy();
}
