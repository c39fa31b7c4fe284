import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { pool, poolMultilevel, robustPool } from '../../shared/stats/index.js';
import { anonymous, createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

const filters = { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' };
const multilevel = { filters, dependence: { mode: 'multilevel', robust: true } };

describe('POST /api/syntheses with dependence { mode: "multilevel" }', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    // one paper with two experiments of two effects each
    await settleInventedReference(t.ctx.db, 'luminance', 2019, [
      { mean1: 700, mean2: 610, sd: 90, n: 18, second: { mean1: 680, mean2: 600 } },
      { mean1: 655, mean2: 615, sd: 85, n: 22, second: { mean1: 690, mean2: 620 } },
    ]);
    await settleInventedReference(t.ctx.db, 'pitch', 2020, [{ mean1: 650, mean2: 600, sd: 80, n: 20, second: { mean1: 640, mean2: 600 } }]);
  });
  afterAll(() => t.close());

  it('keeps every effect, clusters by paper and answers the CR2 robust test over exactly the rows it returns', async () => {
    const res = await anonymous(t.app).post('/api/syntheses').send(multilevel);
    expect(res.status).toBe(200);
    expect(res.body.counts).toEqual({ effects: 17, studies: 14, references: 13 });
    expect(res.body.rows).toHaveLength(17);
    expect(res.body.dependence).toEqual({ mode: 'multilevel', robust: true });
    const input = { effects: res.body.rows.map((r: any) => r.effect), variances: res.body.rows.map((r: any) => r.variance), cluster: res.body.rows.map((r: any) => r.referenceId) };
    const model = poolMultilevel(input);
    const robust = robustPool(input);
    expect(res.body.result.estimate).toBeCloseTo(robust.estimate, 12);
    expect(res.body.result.se).toBeCloseTo(robust.se, 12);
    expect(res.body.result.statistic_df).toBeCloseTo(robust.df, 10);
    expect(res.body.multilevel).toMatchObject({ clusters: 13, robust: true });
    expect(res.body.multilevel.sigma2_within).toBeCloseTo(model.sigma2_within, 12);
    expect(res.body.multilevel.model.se).toBeCloseTo(model.se, 12);
    expect(res.body.rows.reduce((s: number, r: any) => s + r.weight, 0)).toBeCloseTo(100, 9);
    // the forest plot groups effects under their paper, each with a paper line
    const papers = res.body.figures.forest.data.filter((tr: any) => tr.meta === 'paper');
    expect(papers).toHaveLength(13);
    expect(res.body.leaveOneOut).toHaveLength(13);
    // cumulative starts at the first paper: its effects pooled by REML on their own (one paper has no σ²_between)
    expect(res.body.cumulative).toHaveLength(13);
    const first = res.body.cumulative[0];
    const firstRows = res.body.rows.filter((r: any) => r.studyId === first.studyId || res.body.rows.find((q: any) => q.studyId === first.studyId)?.referenceId === r.referenceId);
    expect(first.k).toBe(firstRows.length);
    if (firstRows.length === 1) expect(first.estimate).toBeCloseTo(firstRows[0].effect, 12);
    else expect(first.estimate).toBeCloseTo(pool({ effects: firstRows.map((r: any) => r.effect), variances: firstRows.map((r: any) => r.variance), method: 'REML' }).estimate, 12);
    expect(res.body.cumulative[12].estimate).toBeCloseTo(res.body.result.estimate, 9);
    expect(res.body.unavailable.map((u: any) => u.analysis)).toEqual(expect.arrayContaining(["Egger's test", "Begg's test", 'trim-and-fill']));
  });

  it('runs subgroups and meta-regression under the model; model-based inference when robust is false', async () => {
    const res = await anonymous(t.app).post('/api/syntheses').send({ ...multilevel, dependence: { mode: 'multilevel', robust: false }, subgroup: 'modality', moderator: 'year' });
    expect(res.status).toBe(200);
    expect(res.body.multilevel.robustTest).toBeNull();
    expect(res.body.result.statistic_df).toBeNull();
    expect(res.body.subgroups.groups.map((g: any) => g.value).sort()).toEqual(['auditory', 'visual']);
    expect(res.body.subgroups.Q_between).toBeGreaterThanOrEqual(0);
    expect(res.body.metaRegression.k).toBe(17);
  });

  it('aggregate mode answers the sensitivity table over r and the inverse-variance composite on request', async () => {
    const plain = await anonymous(t.app).post('/api/syntheses').send({ filters, dependence: { mode: 'aggregate', r: 0.5 } });
    const weighted = await anonymous(t.app).post('/api/syntheses').send({ filters, dependence: { mode: 'aggregate', r: 0.5, weighted: true } });
    expect(plain.status).toBe(200);
    expect(plain.body.correlationSensitivity.map((r: any) => r.r)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 0.9]);
    expect(plain.body.papersWithSeveralEffects).toBe(2);
    expect(weighted.body.dependence).toEqual({ mode: 'aggregate', r: 0.5, weighted: true });
    expect(weighted.body.result.estimate).not.toBeCloseTo(plain.body.result.estimate, 8);
  });

  it('answers 422 with a clear message when the model cannot be fitted (one paper), 400 for a bad robust flag', async () => {
    const one = await anonymous(t.app).post('/api/syntheses').send({ ...multilevel, filters: { manipulation: 'pitch' } });
    expect(one.status).toBe(422);
    expect(one.body.error.message).toMatch(/three-level model cannot be fitted.*one cluster.*at least 2 papers/);
    const bad = await anonymous(t.app).post('/api/syntheses').send({ ...multilevel, dependence: { mode: 'multilevel', robust: 'yes' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.dependence.robust');
  });

  it('a snapshot freezes the dependence settings and its methods paragraph names the model, the clusters and the variance estimator', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const live = await reviewer.post('/api/syntheses').send(multilevel);
    const created = await reviewer.post('/api/snapshots').send(multilevel);
    expect(created.status).toBe(201);
    const got = await request(t.app).get(`/api/snapshots/${created.body.id}`);
    expect(got.body.request.dependence).toEqual({ mode: 'multilevel', robust: true });
    expect(got.body.dependence).toEqual({ mode: 'multilevel', robust: true });
    expect(got.body.multilevel).toEqual(live.body.multilevel);
    expect(got.body.result).toEqual(live.body.result);
    const methods = await request(t.app).get(`/api/snapshots/${created.body.id}/methods.txt`);
    expect(methods.text).toMatch(/three-level random-effects model/);
    expect(methods.text).toMatch(/13 papers as clusters/);
    expect(methods.text).toMatch(/CR2 variance estimator.*Satterthwaite/);
    expect(methods.text).not.toMatch(/DerSimonian/);
  });
  it('POST /api/syntheses?rows=page pages and sorts the pooled rows on the server (missing values last, ties in row order); bad paging is a 400', async () => {
    const full = (await anonymous(t.app).post('/api/syntheses').send(multilevel)).body;
    const all = full.rows as any[];
    const page = (query: string) => anonymous(t.app).post(`/api/syntheses?rows=page&${query}`).send(multilevel);
    const first = await page('page=2&pageSize=5');
    expect(first.status).toBe(200);
    expect(first.body.rowsPage).toEqual({ rows: 'page', total: 17, page: 2, pageSize: 5, sort: 'position', order: 'asc' });
    expect(first.body.rows).toEqual(all.slice(5, 10));
    expect(first.body.result.weights).toEqual(full.result.weights.slice(5, 10));
    // the order rowOrder promises: missing values last either way, ties in the answer's own order
    const expected = (value: (r: any) => unknown, dir: 1 | -1) =>
      all
        .map((r, i) => ({ r, i, v: value(r) }))
        .sort((a, b) => {
          if (a.v == null || b.v == null) return a.v == null && b.v == null ? a.i - b.i : a.v == null ? 1 : -1;
          const c = typeof a.v === 'number' ? (a.v as number) - (b.v as number) : a.v < b.v! ? -1 : a.v > b.v! ? 1 : 0;
          return c * dir || a.i - b.i;
        })
        .map((x) => x.r);
    const byWeight = await page('pageSize=200&sort=weight&order=desc');
    expect(byWeight.body.rows).toEqual(expected((r) => r.weight, -1));
    const byLabel = await page('pageSize=200&sort=label');
    const labels = byLabel.body.rows.map((r: any) => r.label);
    expect(labels).toEqual([...labels].sort((a: string, b: string) => (a < b ? -1 : a > b ? 1 : 0)));
    expect(byLabel.body.rows).toEqual(expected((r) => r.label, 1));
    // papers with several effects share a year and an n: ties keep the answer's order in both directions
    for (const order of ['asc', 'desc'] as const) {
      const byYear = await page(`pageSize=200&sort=year&order=${order}`);
      expect(byYear.body.rows).toEqual(expected((r) => r.year, order === 'asc' ? 1 : -1));
      const byEffects = await page(`pageSize=200&sort=effects&order=${order}`);
      expect(byEffects.body.rows).toEqual(all);
    }
    // without a subgroup every row lacks one: missing values all, so the answer's own order in both directions
    for (const order of ['asc', 'desc'] as const) expect((await page(`pageSize=200&sort=subgroup&order=${order}`)).body.rows).toEqual(all);
    const grouped = { ...multilevel, subgroup: 'modality' };
    const groupedRows = (await anonymous(t.app).post('/api/syntheses').send(grouped)).body.rows as any[];
    const bySubgroup = await anonymous(t.app).post('/api/syntheses?rows=page&pageSize=200&sort=subgroup&order=desc').send(grouped);
    expect(bySubgroup.body.rowsPage.total).toBe(groupedRows.length);
    const subgroups = bySubgroup.body.rows.map((r: any) => r.subgroup);
    expect(new Set(subgroups).size).toBe(2);
    expect(subgroups).toEqual([...subgroups].sort().reverse());
    expect(bySubgroup.body.rows.filter((r: any) => r.subgroup === subgroups[0])).toEqual(groupedRows.filter((r) => r.subgroup === subgroups[0]));
    const bad = await page('page=0&sort=colour');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: any) => d.path).sort()).toEqual(['query.page', 'query.sort']);
  });
});
