// 1,000 followed syntheses re-checked after one settlement (issue 16 target: < 10 s).
import { createDb } from '../../server/db/knex.js';
import { ensureDemoPeople } from '../../seeds/01_demo_people.js';
import { followSynthesis, recheckFollows } from '../../server/services/following.js';
import { synthesisRequestSchema } from '../../shared/schemas/synthesis.js';
import { settleInventedReference, settleInventedSet } from '../api/syntheses-fixtures.js';

const db = createDb(process.env.DATABASE_URL!);
const origin = 'http://127.0.0.1';

async function main() {
  await ensureDemoPeople(db);
  await settleInventedSet(db, 'luminance');
  await settleInventedSet(db, 'pitch');
  const user = await db('users').where({ login: 'reader' }).first('id');
  for (let i = 0; i < 1000; i++) {
    const manipulation = i % 2 ? 'luminance' : 'pitch';
    const request = synthesisRequestSchema.parse({ filters: { manipulation, metric: 'g_s', yearFrom: 2000 + (i % 5) }, method: i % 3 ? 'DL' : 'REML' });
    await followSynthesis(db, user.id, { request, seShare: 0.5, weightShare: 0.2 }, origin);
  }
  await settleInventedReference(db, 'luminance', 2024, [{ mean1: 900, mean2: 600, sd: 80, n: 150 }]);
  const t0 = performance.now();
  const r = await recheckFollows({ db, jobs: null, appOrigin: origin });
  const ms = performance.now() - t0;
  console.log(`follows: ${r.checked} checked, ${r.rerun} re-run, ${r.notified} notified in ${ms.toFixed(0)} ms (target < 10000 ms)`);
  await db.destroy();
  if (ms >= 10_000) process.exit(1);
}
void main();
