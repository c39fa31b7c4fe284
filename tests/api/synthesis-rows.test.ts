import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

// Large synthesis answers (issue 10, Load): the per-study rows paged or left out on request.
describe('POST /api/syntheses?rows=page|none', () => {
  let t: TestApp;
  const request = { filters: { manipulation: 'luminance', metric: 'g_s' }, method: 'REML' };
  let full: any;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    const res = await anonymous(t.app).post('/api/syntheses').send(request);
    expect(res.status).toBe(200);
    full = res.body;
    expect(full.rows).toHaveLength(12);
    expect(full.rowsPage).toBeUndefined();
  });
  afterAll(() => t.close());

  it('answers one page of the rows sorted on the server, with their weights beside them and the whole synthesis otherwise', async () => {
    const byEffect = full.rows.map((r: any, i: number) => ({ r, w: full.result.weights[i] })).sort((a: any, b: any) => b.r.effect - a.r.effect);
    const pages = [];
    for (const page of [1, 2, 3]) {
      const res = await anonymous(t.app).post(`/api/syntheses?rows=page&page=${page}&pageSize=5&sort=effect&order=desc`).send(request);
      expect(res.status).toBe(200);
      expect(res.body.rowsPage).toEqual({ rows: 'page', total: 12, page, pageSize: 5, sort: 'effect', order: 'desc' });
      pages.push(res.body);
    }
    expect(pages.map((p) => p.rows.length)).toEqual([5, 5, 2]);
    const rows = pages.flatMap((p) => p.rows);
    expect(rows).toEqual(byEffect.map((x: any) => x.r));
    expect(pages.flatMap((p) => p.result.weights)).toEqual(byEffect.map((x: any) => x.w));
    for (const p of pages) {
      const { weights: _w, ...pooled } = p.result;
      const { weights: _fw, ...fullPooled } = full.result;
      expect(pooled).toEqual(fullPooled);
      expect(p.counts).toEqual(full.counts);
      expect(p.figures).toEqual(full.figures);
      expect(p.leaveOneOut).toEqual(full.leaveOneOut);
    }
    // the engine's own order by default
    const first = await anonymous(t.app).post('/api/syntheses?rows=page&pageSize=4').send(request);
    expect(first.body.rows).toEqual(full.rows.slice(0, 4));
    const beyond = await anonymous(t.app).post('/api/syntheses?rows=page&page=9&pageSize=5').send(request);
    expect(beyond.status).toBe(200);
    expect(beyond.body.rows).toEqual([]);
    expect(beyond.body.rowsPage.total).toBe(12);
  });

  it('leaves the rows out with rows=none and keeps the pooled result', async () => {
    const res = await anonymous(t.app).post('/api/syntheses?rows=none').send(request);
    expect(res.status).toBe(200);
    expect(res.body.rows).toEqual([]);
    expect(res.body.result.weights).toEqual([]);
    expect(res.body.rowsPage).toEqual({ rows: 'none', total: 12 });
    expect(res.body.result.estimate).toBe(full.result.estimate);
    expect(res.body.result.tau2).toBe(full.result.tau2);
    expect(res.text.length).toBeLessThan(JSON.stringify(full).length);
  });

  it('refuses a bad rows query with 400 naming the field', async () => {
    const cases: Array<[string, string]> = [
      ['rows=some', 'query.rows'],
      ['rows=page&pageSize=1000', 'query.pageSize'],
      ['rows=page&sort=colour', 'query.sort'],
      ['page=2', 'query.rows'],
    ];
    for (const [query, path] of cases) {
      const res = await anonymous(t.app).post(`/api/syntheses?${query}`).send(request);
      expect(res.status, query).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
      expect(res.body.error.details.map((d: any) => d.path)).toContain(path);
    }
    const alone = await anonymous(t.app).post('/api/syntheses?page=2').send(request);
    expect(alone.body.error.details[0].message).toBe('paging and sorting the rows apply only when the rows are asked for page by page');
  });
});
