import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { up, down } from '../../migrations/20261203300000_relabel_smd_metrics.js';
import { anonymous, createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

// Standardized mean differences keyed by standardizer (issue 11): g_s, g_av, g_rm, g_z.
describe('metric keys g_s / g_av / g_rm / g_z', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance'); // 13 g_s effects
    const paired = (reported: Record<string, number>) => ({ mean1: 0, mean2: 0, sd: 1, n: 20, form: 'smd_paired' as const, reported });
    await settleInventedReference(t.ctx.db, 'luminance', 2021, [paired({ mean_diff: 40, sd_diff: 80, n: 20, r: 0.7 })]); // g_rm
    await settleInventedReference(t.ctx.db, 'luminance', 2022, [paired({ mean1: 640, sd1: 90, mean2: 600, sd2: 85, n: 20, r: 0.6 })]); // g_av
    await settleInventedReference(t.ctx.db, 'luminance', 2023, [paired({ t: 2.4, n: 20 })]); // g_z
    await settleInventedReference(t.ctx.db, 'luminance', 2024, [paired({ t: 2.1, n: 24 })]); // g_z
  });
  afterAll(() => t.close());

  const post = (body: object) => anonymous(t.app).post('/api/syntheses').send(body);

  it('stores each effect under its standardizer; a paired t with no r is g_z', async () => {
    const rows = await t.ctx.db('effects').select('metric', 'formula').orderBy('id');
    const by = new Map(rows.map((r) => [r.formula, r.metric]));
    expect(by.get('smd.ind.means')).toBe('g_s');
    expect(by.get('smd.paired.sd_diff')).toBe('g_rm');
    expect(by.get('smd.paired.sds')).toBe('g_av');
    expect(by.get('smd.paired.dz_t')).toBe('g_z');
    const facets = (await anonymous(t.app).get('/api/syntheses/facets')).body;
    expect(facets.metrics).toEqual([
      { value: 'g_av', count: 1 },
      { value: 'g_rm', count: 1 },
      { value: 'g_s', count: 13 },
      { value: 'g_z', count: 2 },
    ]);
    const effects = await anonymous(t.app).get('/api/effects?metric=g_z');
    expect(effects.status).toBe(200);
    expect(effects.body.total).toBe(2);
  });

  it('refuses a mixed request with 422, g_z never with the others, and offers each metric and the raw-score family', async () => {
    const res = await post({ filters: { manipulation: 'luminance' } });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/g_s: 13, g_z: 2, g_av: 1, g_rm: 1/);
    expect(res.body.error.message).toMatch(/g_z .*never pooled with g_s, g_av or g_rm/);
    expect(res.body.error.message).toMatch(/"smdFamily": "raw_score"/);
    const choices = res.body.error.details.choices as Array<{ label: string; effects: number; request: any }>;
    expect(choices.map((c) => c.request.filters.metric ?? c.request.smdFamily)).toEqual(['g_s', 'g_z', 'g_av', 'g_rm', 'raw_score']);
    expect(choices.at(-1)).toMatchObject({ effects: 15, request: { filters: { manipulation: 'luminance' }, smdFamily: 'raw_score' } });
    // the screen's words name the metrics by their labels, with no request syntax
    const inWords = res.body.error.details.inWords as string;
    expect(inWords).toMatch(/Hedges' g_s \(independent groups\): 13/);
    expect(inWords).toMatch(/never pooled with a g_s, g_av or g_rm/);
    expect(inWords).not.toMatch(/["{}]|filters|smdFamily/);
    // every choice is a request that pools
    for (const c of choices) expect((await post(c.request)).status).toBe(200);
  });

  it('pools g_s, g_av and g_rm together only with "smdFamily": "raw_score", never g_z, and the methods paragraph says so', async () => {
    const res = await post({ filters: { manipulation: 'luminance' }, smdFamily: 'raw_score' });
    expect(res.status).toBe(200);
    expect(res.body.metric).toBe('smd_raw_score');
    expect(JSON.stringify(res.body.figures.forest)).toMatch(/raw-score standardized mean difference/);
    expect(res.body.counts.effects).toBe(15);
    const one = await post({ filters: { manipulation: 'luminance', metric: 'g_rm' }, smdFamily: 'raw_score' });
    expect(one.body.counts.effects).toBe(15);
    const gz = await post({ filters: { manipulation: 'luminance', metric: 'g_z' }, smdFamily: 'raw_score' });
    expect(gz.status).toBe(400);
    expect(gz.body.error.details).toEqual([{ path: 'body.smdFamily', message: expect.stringMatching(/g_s, g_av, g_rm/) }]);
    expect((await post({ filters: { manipulation: 'luminance', metric: 'g_z' } })).body.counts.effects).toBe(2);
    const bad = await post({ filters: { manipulation: 'luminance' }, smdFamily: 'everything' });
    expect(bad.status).toBe(400);

    const created = await (await import('../support/test-app.js')).signIn(t.app, 'reviewer');
    const snap = await created.post('/api/snapshots').send({ filters: { manipulation: 'luminance' }, smdFamily: 'raw_score' });
    expect(snap.status).toBe(201);
    const view = await anonymous(t.app).get(`/api/snapshots/${snap.body.id}`);
    expect(view.body.methods).toMatch(/"smdFamily": "raw_score"/);
    expect(view.body.methods).toMatch(/g_z, standardized by the SD of the differences, was not pooled with them/);
    const csv = await anonymous(t.app).get(`/api/snapshots/${snap.body.id}/export.csv`);
    expect(csv.text).toMatch(/smd_raw_score/);
    expect(csv.text).not.toMatch(/hedges_g/);
  });

  it('the migration relabels stored effects from their formula ids, keeps values and versions, and goes down again', async () => {
    const before = await t.ctx.db('effects').select('id', 'metric', 'effect', 'variance', 'version').orderBy('id');
    await down(t.ctx.db);
    expect(new Set((await t.ctx.db('effects').pluck('metric')) as string[])).toEqual(new Set(['hedges_g']));
    // an old row without a known formula: the form and r decide
    const sample = await t.ctx.db('effects').where({ formula: 'smd.paired.dz_t' }).first('id');
    await t.ctx.db('effects').where({ id: sample.id }).update({ formula: null });
    await up(t.ctx.db);
    expect(await t.ctx.db('effects').select('id', 'metric', 'effect', 'variance', 'version').orderBy('id')).toEqual(before);
  });
});
