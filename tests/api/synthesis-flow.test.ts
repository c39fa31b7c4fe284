import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', metric: 'g_s', yearFrom: 2000 }, method: 'DL', dependence: { mode: 'aggregate', r: 0.5 } };
const n = (rows: Array<{ n: string | number }>) => Number(rows[0].n);

describe('synthesis flow (PRISMA 2020 per synthesis) and its diagram', () => {
  let t: TestApp;
  let reviewer: Agent;
  let curator: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    const db = t.ctx.db;
    await settleInventedSet(db, 'luminance'); // 12 that enter (2005–2016, g_s)
    for (let i = 0; i < 3; i++) await settleInventedReference(db, 'size', 2010 + i, [{ mean1: 650, mean2: 600, sd: 90, n: 20 }]);
    for (let i = 0; i < 2; i++) await settleInventedReference(db, 'luminance', 2012 + i, [{ mean1: 700, mean2: 640, sd: 90, n: 20, form: 'log_ratio' }]);
    await settleInventedReference(db, 'luminance', 1995, [{ mean1: 680, mean2: 600, sd: 90, n: 20 }]);
    const plain = (title: string, status: string) => ({ csl: JSON.stringify({ title }), title, title_key: title.toLowerCase(), year: 2019, screening_status: status, source: 'bibtex' });
    await db('refs').insert([1, 2, 3, 4, 5].map((i) => plain(`Waiting paper ${i} on interval timing`, 'unscreened')));
    await db('refs').insert([1, 2].map((i) => plain(`Included paper ${i} on interval timing`, 'included')));
    const toExclude: Array<{ id: number }> = await db('refs').insert([1, 2, 3, 4].map((i) => plain(`Off-topic paper ${i}`, 'unscreened'))).returning('id');
    const fullText: Array<{ id: number }> = await db('refs').insert([1, 2].map((i) => plain(`Full-text paper ${i} on interval timing`, 'awaiting_full_text'))).returning('id');
    const [kept] = await db('refs').where({ title: 'Waiting paper 1 on interval timing' }).select('id');
    await db('refs').insert({ ...plain('Waiting paper 1 on interval timing (copy)', 'unscreened'), merged_into: kept.id });
    reviewer = await signIn(t.app, 'reviewer');
    curator = await signIn(t.app, 'curator');
    for (const [i, r] of toExclude.entries()) {
      const res = await curator.post(`/api/references/${r.id}/screening`).send({ decision: 'excluded', reason: i < 3 ? 'wrong_population' : 'not_time_perception', version: 1 });
      expect(res.status).toBe(201);
    }
    const ftOut = await curator.post(`/api/references/${fullText[0].id}/screening`).send({ decision: 'excluded', stage: 'full_text', reason: 'no_usable_statistics', version: 1 });
    expect(ftOut.status).toBe(201);
  });
  afterAll(() => t.close());

  it('counts each stage from the data: screening with reasons, coding, settling, and which filter set a reference aside', async () => {
    const res = await request(t.app).post('/api/syntheses/flow').send(body);
    expect(res.status).toBe(200);
    const { flow } = res.body;
    const db = t.ctx.db;
    const all = n(await db('refs').count({ n: '*' }));
    const live = n(await db('refs').whereNull('merged_into').count({ n: '*' }));
    expect(flow.identified.total).toBe(all);
    expect(flow.identified.bySource).toEqual({ manual: 18, bibtex: 14 });
    expect(flow.duplicatesRemoved).toEqual({ total: 1, importDuplicates: 0, merged: 1 });
    expect(flow.afterDuplicates).toBe(live);
    const stage = Object.fromEntries(flow.stages.map((s: { stage: string }) => [s.stage, s]));
    // title and abstract: 5 waiting, 4 excluded, 22 passed (20 included, 2 sent to the full text); full text: 1 excluded, 1 waiting
    expect(stage.screening).toBeUndefined();
    expect(stage.title_abstract).toMatchObject({ entered: 31, passed: 22, excluded: 4, pending: 5, pendingLabel: 'not yet screened' });
    expect(stage.title_abstract.excludedByReason).toEqual([
      { reason: 'wrong_population', label: 'Wrong population', count: 3 },
      { reason: 'not_time_perception', label: 'Not about time perception', count: 1 },
    ]);
    expect(stage.full_text).toMatchObject({ entered: 22, passed: 20, excluded: 1, pending: 1, pendingLabel: 'awaiting full-text screening' });
    expect(stage.full_text.excludedByReason).toEqual([{ reason: 'no_usable_statistics', label: 'No usable statistics', count: 1 }]);
    // the same counts as the screening screen's, stage by stage
    const counts = (await curator.get('/api/screening/counts')).body;
    expect(stage.title_abstract.excluded).toBe(counts.stages.title_abstract.excluded);
    expect(stage.full_text.passed).toBe(counts.stages.full_text.included);
    expect(stage.coding).toMatchObject({ entered: 20, passed: 18, pending: 2 });
    expect(stage.reconciliation).toMatchObject({ entered: 18, passed: 18, pending: 0 });
    expect(stage.synthesis).toMatchObject({ entered: 18, passed: 12, excluded: 6 });
    expect(stage.synthesis.excludedByReason).toEqual([
      { reason: 'manipulation', label: 'Another manipulation', count: 3 },
      { reason: 'metric', label: 'Another metric', count: 2 },
      { reason: 'years', label: 'Outside the years', count: 1 },
    ]);
    // what enters is what the synthesis pools
    const synthesis = await request(t.app).post('/api/syntheses').send(body);
    expect(flow.entering).toEqual(synthesis.body.counts);
    expect(flow.entering).toEqual({ references: 12, studies: 12, effects: 13 });
    expect(res.body.registryVersion).toBe(synthesis.body.registryVersion);
  });

  it('a snapshot keeps the flow it was saved with; both diagrams download as SVG named by snapshot id or registry version', async () => {
    const created = await reviewer.post('/api/snapshots').send(body);
    expect(created.status).toBe(201);
    const live = await request(t.app).post('/api/syntheses/flow').send(body);
    const frozen = await request(t.app).get(`/api/snapshots/${created.body.id}`);
    expect(frozen.body.flow).toEqual(live.body.flow);

    const svg = await request(t.app).get(`/api/snapshots/${created.body.id}/flow.svg`).buffer(true).parse((r, done) => {
      let text = '';
      r.on('data', (c: Buffer) => (text += c.toString('utf8')));
      r.on('end', () => done(null, text));
    });
    expect(svg.status).toBe(200);
    expect(svg.headers['content-type']).toMatch(/image\/svg\+xml/);
    expect(svg.headers['content-disposition']).toBe(`attachment; filename="chronometa-snapshot-${created.body.id}-flow.svg"`);
    expect(svg.body).toContain('Entering this synthesis (n = 12 references)');
    expect(svg.body).toContain('Not yet screened (n = 5)');
    expect(svg.body).toContain('Wrong population: 3');

    const liveSvg = await request(t.app).get(`/api/syntheses/export/flow.svg?request=${encodeURIComponent(JSON.stringify(body))}`);
    expect(liveSvg.status).toBe(200);
    expect(liveSvg.headers['content-disposition']).toBe(`attachment; filename="chronometa-synthesis-v${live.body.registryVersion}-flow.svg"`);
  });

  it('a snapshot saved before flows were kept says it has no diagram', async () => {
    const [row] = await t.ctx.db('snapshots').select('id');
    await t.ctx.db.raw(`INSERT INTO snapshots SELECT (s).* FROM (SELECT jsonb_populate_record(s, jsonb_build_object('id', 'older0000000000', 'flow', NULL)) AS s FROM snapshots s WHERE id = ?) x`, [row.id]);
    const res = await request(t.app).get('/api/snapshots/older0000000000/flow.svg');
    expect(res.status).toBe(404);
    expect(res.headers['content-disposition']).toBeUndefined();
    expect(res.body.error.message).toMatch(/saved before the flow of records was kept/);
    expect((await request(t.app).get('/api/snapshots/older0000000000')).body.flow).toBeNull();
  });
});
