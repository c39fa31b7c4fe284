import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { pool } from '../../shared/stats/pool.js';
import { anonymous, createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

describe('POST /api/syntheses', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
  });
  afterAll(() => t.close());

  it('answers rows one per study and the engine result for exactly those rows', async () => {
    const res = await anonymous(t.app)
      .post('/api/syntheses')
      .send({ filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } });
    expect(res.status).toBe(200);
    expect(res.body.rows).toHaveLength(12);
    expect(res.body.counts).toEqual({ effects: 13, studies: 12, references: 12 });
    for (const r of res.body.rows) for (const k of ['studyId', 'referenceId', 'label', 'effect', 'variance']) expect(r).toHaveProperty(k);
    const direct = pool({ effects: res.body.rows.map((r: any) => r.effect), variances: res.body.rows.map((r: any) => r.variance), method: 'DL', hksj: false });
    expect(res.body.result).toEqual(JSON.parse(JSON.stringify(direct)));
    expect(res.body.registryVersion).toBeGreaterThan(0);
    expect(res.body.figures.forest.data.length).toBeGreaterThan(3);
    expect(res.body.cautions.at(-1).code).toBe('not_clinical');
  });

  it('honours estimator, HKSJ, level, one-per-study and subgroup options', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const res = await reviewer.post('/api/syntheses').send({
      filters: { manipulation: ['luminance'] },
      method: 'REML',
      hksj: true,
      level: 0.9,
      dependence: { mode: 'one', rule: 'smallest_variance' },
      subgroup: 'modality',
      moderator: 'standardMs',
    });
    expect(res.status).toBe(200);
    expect(res.body.result.method).toBe('REML');
    expect(res.body.result.hksj).toBe(true);
    expect(res.body.result.level).toBe(0.9);
    expect(res.body.rows.every((r: any) => r.effectIds.length === 1)).toBe(true);
    expect(res.body.subgroups.groups.map((g: any) => g.value).sort()).toEqual(['auditory', 'visual']);
    expect(res.body.subgroups.df).toBe(1);
    expect(res.body.metaRegression.k).toBe(12);
    expect(res.body.leaveOneOut).toHaveLength(12);
    expect(res.body.cumulative.map((c: any) => c.year)).toEqual([...res.body.cumulative.map((c: any) => c.year)].sort());
  });

  it('refuses mixed metrics with 422 naming them and how to filter', async () => {
    await settleInventedReference(t.ctx.db, 'luminance', 2020, [{ mean1: 700, mean2: 640, sd: 90, n: 20, form: 'log_ratio' }]);
    const res = await anonymous(t.app).post('/api/syntheses').send({ filters: { manipulation: 'luminance' } });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/g_s: 13/);
    expect(res.body.error.message).toMatch(/log_ratio: 1/);
    expect(res.body.error.message).toMatch(/metric/);
    expect(res.body.error.details.metrics).toHaveLength(2);
  });

  it('says when nothing matches, and rejects bad input field by field', async () => {
    const none = await anonymous(t.app).post('/api/syntheses').send({ filters: { manipulation: 'pitch' } });
    expect(none.status).toBe(422);
    expect(none.body.error.message).toMatch(/No settled effects/);
    const bad = await anonymous(t.app).post('/api/syntheses').send({ method: 'XYZ', filters: { yearFrom: 2020, yearTo: 2010 }, dependence: { mode: 'aggregate', r: 2 } });
    expect(bad.status).toBe(400);
    const paths = bad.body.error.details.map((d: any) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['body.method', 'body.dependence.r']));
  });

  it('works with a Bearer token from a script', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const { body } = await reviewer.post('/api/tokens').send({ name: 'pooling script' });
    const res = await request(t.app)
      .post('/api/syntheses')
      .set('Authorization', `Bearer ${body.token}`)
      .send({ filters: { manipulation: 'luminance', metric: 'g_s' } });
    expect(res.status).toBe(200);
    expect(res.body.result.k).toBe(12);
  });

  it('keeps an answer per registry version: repeated requests hit, a settled change recomputes', async () => {
    const req = { filters: { manipulation: 'luminance', metric: 'g_s' }, level: 0.9 };
    const first = await anonymous(t.app).post('/api/syntheses').send(req);
    const again = await anonymous(t.app).post('/api/syntheses').send(req);
    expect(first.headers['x-synthesis-cache']).toBe('miss');
    expect(again.headers['x-synthesis-cache']).toBe('hit');
    expect(again.body).toEqual(first.body);
    await settleInventedReference(t.ctx.db, 'luminance', 2024, [{ mean1: 720, mean2: 600, sd: 80, n: 30 }]);
    const after = await anonymous(t.app).post('/api/syntheses').send(req);
    expect(after.headers['x-synthesis-cache']).toBe('miss');
    expect(after.body.registryVersion).toBeGreaterThan(first.body.registryVersion);
    expect(after.body.rows).toHaveLength(first.body.rows.length + 1);
  });

  it('lists filter values with counts', async () => {
    const res = await anonymous(t.app).get('/api/syntheses/facets');
    expect(res.status).toBe(200);
    expect(res.body.manipulations).toEqual([{ value: 'luminance', count: 15, label: 'Luminance' }]);
    expect(res.body.metrics.map((m: any) => m.value)).toEqual(['g_s', 'log_ratio']);
  });
});

describe('POST /api/syntheses rate limit', () => {
  it('limits each caller from its own budget: a signed-out address that spent it does not hold back a signed-in user', async () => {
    const t = await createTestApp({ env: { CALLER_BUDGET_PER_MINUTE: '2' } });
    try {
      await resetDb(t.ctx.db);
      const body = { filters: { manipulation: 'pitch' } };
      const codes = [];
      for (let i = 0; i < 3; i++) codes.push((await anonymous(t.app).post('/api/syntheses').send(body)).status);
      expect(codes).toEqual([422, 422, 429]);
      const reviewer = await signIn(t.app, 'reviewer');
      for (let i = 0; i < 2; i++) expect((await reviewer.post('/api/syntheses').send(body)).status).toBe(422);
    } finally {
      await t.close();
    }
  });
});
