import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { SIGN_CONVENTIONS } from '../../shared/vocabulary/parameters.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

describe('atlas', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    await settleInventedReference(t.ctx.db, 'loudness', 2018, [{ mean1: 610, mean2: 600, sd: 70, n: 18, modality: 'auditory' }]);
  });
  afterAll(() => t.close());

  it('lists every manipulation and outcome kind with counts', async () => {
    const res = await request(t.app).get('/api/atlas');
    expect(res.status).toBe(200);
    const lum = res.body.manipulations.find((m: any) => m.term === 'luminance');
    expect(lum).toMatchObject({ label: 'Luminance', effects: 13, studies: 12, references: 12, outcomes: ['duration_distortion'] });
    expect(res.body.manipulations.find((m: any) => m.term === 'pitch')).toMatchObject({ effects: 0 });
    expect(res.body.outcomes.find((o: any) => o.kind === 'duration_distortion')).toMatchObject({ effects: 14, references: 13 });
    expect(res.body.outcomes).toHaveLength(6);
    // each manipulation carries its current estimates, the same numbers as its own page, with k and the sign convention
    const page = (await request(t.app).get('/api/atlas/manipulations/luminance/pooled')).body;
    expect(lum.estimates).toHaveLength(1);
    expect(lum.estimates[0].pooled).toEqual(page.cells[0].pooled);
    expect(lum.estimates[0].counts).toEqual({ effects: 13, studies: 12, references: 12 });
    expect(lum.estimates[0].signConvention).toBe(SIGN_CONVENTIONS.duration_distortion);
    expect(lum.estimates[0]).not.toHaveProperty('forest');
    expect(res.body.manipulations.find((m: any) => m.term === 'pitch').estimates).toEqual([]);
  });

  it('a manipulation page pools each outcome and metric exactly as the synthesis does, with its forest plot', async () => {
    const page = await request(t.app).get('/api/atlas/manipulations/luminance');
    expect(page.status).toBe(200);
    expect(page.body.manipulation.description).toMatch(/Brighter/);
    expect(page.body.cells).toHaveLength(1);
    const cell = page.body.cells[0];
    expect(cell.filters).toEqual({ manipulation: 'luminance', outcome: 'duration_distortion', parameter: 'duration_ratio', unit: 'ratio', metric: 'g_s' });
    expect(cell.quantityLabel).toBe('Perceived-duration ratio (ratio)');
    const live = await request(t.app).post('/api/syntheses').set('Origin', process.env.APP_ORIGIN!).send({ filters: cell.filters });
    expect(cell.pooled.estimate).toBe(live.body.result.estimate);
    expect(cell.pooled.I2).toBe(live.body.result.I2);
    expect(cell.forest.data.length).toBeGreaterThan(3);
    const pooled = await request(t.app).get('/api/atlas/manipulations/luminance/pooled');
    expect(pooled.body.cells[0].pooled).toEqual(cell.pooled);
    expect(pooled.body.cells[0]).not.toHaveProperty('forest');
  });

  it('answers from the cache until the registry version moves', async () => {
    const before = (await request(t.app).get('/api/atlas/manipulations/loudness/pooled')).body;
    expect(before.totals.effects).toBe(1);
    await settleInventedReference(t.ctx.db, 'loudness', 2021, [{ mean1: 650, mean2: 600, sd: 70, n: 22, modality: 'auditory' }]);
    const after = (await request(t.app).get('/api/atlas/manipulations/loudness/pooled')).body;
    expect(after.totals.effects).toBe(2);
    expect(after.cells[0].pooled.estimate).not.toBe(before.cells[0].pooled.estimate);
  });

  it('an outcome page pools each manipulation; references page and sort on the server', async () => {
    const res = await request(t.app).get('/api/atlas/outcomes/duration_distortion');
    expect(res.body.cells.map((c: any) => c.manipulation)).toEqual(['loudness', 'luminance']);
    const refs = await request(t.app).get('/api/atlas/manipulations/luminance/references?pageSize=5&sort=year&order=desc');
    expect(refs.body.total).toBe(12);
    expect(refs.body.items).toHaveLength(5);
    expect(refs.body.items.map((r: any) => r.year)).toEqual([2016, 2015, 2014, 2013, 2012]);
    expect(refs.body.items[0].doi).toMatch(/^10\.5555\//);
    expect((await request(t.app).get('/api/atlas/outcomes/not_a_kind')).status).toBe(404);
  });
});
