import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { IMPORT_JOB_THRESHOLD, importResultSchema } from '../../shared/schemas/references.js';
import { IMPORT_JOB_CHUNK } from '../../server/services/imports.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib, clearSearch, eventually } from '../support/references.js';

type Result = ReturnType<typeof importResultSchema.parse>;

const entry = (tag: string, i: number) =>
  bib(`${tag}${i}`, { title: `Invented ${tag} study ${i} of filled and empty intervals`, author: 'Jobson, Ada and Lind, Bo', year: '2022', journal: 'Journal of Invented Timing', doi: `10.5555/${tag}.${i}` });

describe('large imports run as a job', () => {
  let t: TestApp;
  let coder: Agent;
  beforeAll(async () => {
    t = await createTestApp({ jobs: true });
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
  });
  afterAll(async () => {
    await t.close();
  });

  /** Polls the batch until it is done or failed; returns the last answer. */
  const settled = (id: number) =>
    eventually(async () => {
      const r = await coder.get(`/api/imports/${id}?entryPage=1`);
      return ['done', 'failed'].includes(r.body.batch.state) ? (importResultSchema.parse(r.body) as Result) : undefined;
    }, 240_000, 300);

  it('3,000 BibTeX entries answer 202 queued, show progress, keep /api/health quick, and end with counts and a paged report', async () => {
    expect(3000).toBeGreaterThan(IMPORT_JOB_THRESHOLD.entries);
    const text = Array.from({ length: 3000 }, (_, i) => entry('jobbed', i + 1)).join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text, label: 'three thousand' });
    expect(res.status).toBe(202);
    const queued = importResultSchema.parse(res.body);
    expect(queued.batch).toMatchObject({ state: 'queued', total: 3000, processed: 0, label: 'three thousand', failure: null });
    expect(queued.entries).toEqual([]);
    expect(queued.statusUrl).toBe(`/api/imports/${queued.batch.id}`);
    expect(res.headers.location).toBe(`/api/imports/${queued.batch.id}`);

    // While the job runs, other requests are answered quickly and the batch shows its progress.
    const healthMs: number[] = [];
    const progress: number[] = [];
    let last: Result | undefined;
    const until = Date.now() + 240_000;
    while (Date.now() < until) {
      const r = importResultSchema.parse((await coder.get(queued.statusUrl!)).body);
      if (r.batch.state === 'done' || r.batch.state === 'failed') {
        last = r;
        break;
      }
      if (r.batch.state === 'running') {
        progress.push(r.batch.processed);
        const start = performance.now();
        const health = await request(t.app).get('/api/health');
        healthMs.push(performance.now() - start);
        expect(health.status).toBe(200);
      }
      await new Promise((resolve) => setTimeout(resolve, 100));
    }
    expect(last?.batch.state).toBe('done');
    expect(healthMs.length).toBeGreaterThan(0);
    expect(Math.max(...healthMs)).toBeLessThan(1000);
    // progress is counted in whole chunks and never goes back
    for (const p of progress) expect(p % IMPORT_JOB_CHUNK).toBe(0);
    expect(progress).toEqual([...progress].sort((a, b) => a - b));

    const done = await settled(queued.batch.id);
    expect(done.batch).toMatchObject({ state: 'done', total: 3000, processed: 3000, failure: null, counts: { imported: 3000, duplicate: 0, rejected: 0, pending: 0 } });
    expect(done.batch.finishedAt).not.toBeNull();
    expect(done.entriesTotal).toBe(3000);
    const page = await coder.get(`/api/imports/${queued.batch.id}?entryPage=12&entryPageSize=250`);
    expect(page.status).toBe(200);
    expect(page.body.entries.map((e: { index: number }) => e.index)).toEqual(Array.from({ length: 250 }, (_, i) => i + 2751));
    expect(page.body.entries.every((e: { status: string; referenceId?: number }) => e.status === 'imported' && e.referenceId)).toBe(true);
    expect(Number((await t.ctx.db('refs').where('doi', 'like', '10.5555/jobbed.%').count({ n: '*' }).first())?.n)).toBe(3000);
    // the stored text goes once the job is done
    expect((await t.ctx.db('import_batches').where({ id: queued.batch.id }).first('source_text')).source_text).toBeNull();
    expect(await t.ctx.db('audit_log').where({ entity_type: 'import_batch', entity_id: String(queued.batch.id) }).orderBy('id').pluck('action')).toEqual(['import.create', 'import.finish']);
  }, 300_000);

  it('reports a bad entry alone and finds duplicates across chunks as within the file', async () => {
    const entries = Array.from({ length: 2100 }, (_, i) => entry('mixed', i + 1));
    entries[1499] = bib('notitle1500', { author: 'Jobson, Ada', year: '2022' });
    entries[2049] = entry('mixed', 10).replace('mixed10,', 'again10,'); // same DOI as entry 10, four chunks later
    entries[2059] = entry('jobbed', 7); // in the registry since the first import
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text: entries.join('\n') });
    expect(res.status).toBe(202);
    const done = await settled(res.body.batch.id);
    expect(done.batch).toMatchObject({ state: 'done', processed: 2100, counts: { imported: 2097, duplicate: 2, rejected: 1, pending: 0 } });
    const rejected = await coder.get(`/api/imports/${done.batch.id}?entryPage=1&entryStatus=rejected`);
    expect(rejected.body.entries).toEqual([expect.objectContaining({ index: 1500, status: 'rejected', message: expect.stringMatching(/^Entry 1500 \(key "notitle1500"\), line \d+: field title is missing$/) })]);
    const dups = (await coder.get(`/api/imports/${done.batch.id}?entryPage=1&entryStatus=duplicate`)).body.entries;
    const first10 = (await coder.get(`/api/imports/${done.batch.id}?entryPage=1&entryPageSize=10`)).body.entries[9];
    expect(dups[0]).toMatchObject({ index: 2050, referenceId: first10.referenceId, message: expect.stringMatching(/same DOI 10\.5555\/mixed\.10 as an earlier entry of this file$/) });
    expect(dups[1]).toMatchObject({ index: 2060, message: expect.stringMatching(/duplicate of reference #\d+ \(same DOI 10\.5555\/jobbed\.7\)$/) });
  }, 300_000);

  it('a job that fails midway says failed, why and how far it got; the chunks before stay imported', async () => {
    await t.ctx.db.raw(`CREATE FUNCTION test_refuse_boom() RETURNS trigger AS $$ BEGIN RAISE EXCEPTION 'the test refuses this reference'; END $$ LANGUAGE plpgsql`);
    await t.ctx.db.raw(`CREATE TRIGGER test_refuse_boom BEFORE INSERT ON refs FOR EACH ROW WHEN (NEW.title LIKE 'Boom%') EXECUTE FUNCTION test_refuse_boom()`);
    try {
      const entries = Array.from({ length: 2000 }, (_, i) => entry('failing', i + 1));
      entries[1099] = bib('boom1100', { title: 'Boom goes the interval', author: 'Jobson, Ada', year: '2022' });
      const res = await coder.post('/api/imports').send({ format: 'bibtex', text: entries.join('\n') });
      expect(res.status).toBe(202);
      const failed = await settled(res.body.batch.id);
      expect(failed.batch.state).toBe('failed');
      expect(failed.batch.failure).toBe('the import stopped after 1,000 of 2,000 entries: the test refuses this reference; the entries read before stay imported');
      expect(failed.batch).toMatchObject({ processed: 1000, counts: { imported: 1000, duplicate: 0, rejected: 0, pending: 0 } });
      expect(failed.batch.finishedAt).not.toBeNull();
      expect(failed.entriesTotal).toBe(1000);
      expect(Number((await t.ctx.db('refs').where('doi', 'like', '10.5555/failing.%').count({ n: '*' }).first())?.n)).toBe(1000);
      expect((await t.ctx.db('import_batches').where({ id: failed.batch.id }).first('source_text')).source_text).toBeNull();
    } finally {
      await t.ctx.db.raw('DROP TRIGGER IF EXISTS test_refuse_boom ON refs');
      await t.ctx.db.raw('DROP FUNCTION IF EXISTS test_refuse_boom()');
    }
  }, 300_000);
});
