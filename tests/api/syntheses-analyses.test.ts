import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { begg, metaRegression, pool, subgroups } from '../../shared/stats/index.js';
import { labelOf } from '../../shared/vocabulary/labels.js';
import { anonymous, createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

const base = { filters: { manipulation: 'luminance', metric: 'g_s' }, dependence: { mode: 'one', rule: 'largest_n' } };

describe('POST /api/syntheses: the analyses (several moderators, one shared τ², I² by estimator, Begg exact)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
  });
  afterAll(() => t.close());

  it('fits several moderators with Knapp–Hartung on exactly the pooled rows, terms named in words, with the per-covariate caution', async () => {
    const res = await anonymous(t.app).post('/api/syntheses').send({ ...base, method: 'REML', hksj: true, moderators: ['year', 'modality'] });
    expect(res.status).toBe(200);
    const reg = res.body.regression;
    const rows = res.body.rows as Array<{ effect: number; variance: number; year: number; effectIds: number[] }>;
    expect(reg.k).toBe(12);
    expect(reg.missing).toBe(0);
    expect(reg.terms.map((x: { label: string }) => x.label)).toEqual(['Intercept', 'Publication year', `Modality: ${labelOf('modality', 'visual')}`]);
    expect(reg.moderators[1]).toMatchObject({ moderator: 'modality', type: 'categorical', reference: 'auditory', referenceLabel: labelOf('modality', 'auditory') });
    expect(reg.QM_test).toBe('F');
    expect([reg.QM_df, reg.QM_df2]).toEqual([2, 9]);
    expect(reg.terms.every((x: { df: number }) => x.df === 9)).toBe(true);
    // the same fit from the engine on the answer's rows (year 2005 + i and modality auditory for every third i in the fixture)
    const direct = metaRegression({
      effects: rows.map((r) => r.effect),
      variances: rows.map((r) => r.variance),
      moderators: [
        { name: 'year', values: rows.map((r) => r.year) },
        { name: 'modality', values: rows.map((r) => ((r.year - 2005) % 3 ? 'visual' : 'auditory')) },
      ],
      method: 'REML',
      hksj: true,
    });
    expect(reg.terms.map((x: { estimate: number }) => x.estimate)).toEqual(direct.coefficients.map((c) => c.estimate));
    expect(reg.QM).toBe(direct.QM);
    expect(reg.fewPerCovariate).toBe(true);
    expect(res.body.cautions.map((c: { code: string }) => c.code)).toContain('few_per_covariate');
    expect(res.body.cautions.at(-1).code).toBe('not_clinical');

    // standard duration rises with the year in this set: the two together cannot be estimated, said in words
    const collinear = await anonymous(t.app).post('/api/syntheses').send({ ...base, moderators: ['standardMs', 'year'] });
    expect(collinear.status).toBe(200);
    expect(collinear.body.regression).toBeNull();
    expect(collinear.body.unavailable).toContainEqual({ analysis: 'meta-regression on several moderators', reason: expect.stringMatching(/do not vary enough to be estimated together/) });
  });

  it('compares subgroups with one shared τ² (F test under HKSJ) or a separate τ² each (Q test)', async () => {
    const shared = await anonymous(t.app).post('/api/syntheses').send({ ...base, method: 'DL', hksj: true, subgroup: 'modality', subgroupTau2: 'pooled' });
    expect(shared.status).toBe(200);
    const s = shared.body.subgroups;
    expect(s).toMatchObject({ tau2Model: 'pooled', test: 'F', df: 1, df2: 10 });
    const rows = shared.body.rows as Array<{ effect: number; variance: number; subgroup: string }>;
    const direct = subgroups({ effects: rows.map((r) => r.effect), variances: rows.map((r) => r.variance), groups: rows.map((r) => r.subgroup), method: 'DL', hksj: true, tau2Model: 'pooled' });
    expect(s.Q_between).toBe(direct.Q_between);
    expect(s.tau2_pooled).toBe(direct.tau2_pooled);
    expect(new Set(s.groups.map((g: { tau2: number }) => g.tau2)).size).toBe(1);

    const separate = await anonymous(t.app).post('/api/syntheses').send({ ...base, method: 'DL', subgroup: 'modality' });
    expect(separate.body.subgroups).toMatchObject({ tau2Model: 'separate', test: 'chisq', tau2_pooled: null, df: 1 });
  });

  it('reports τ² and I² by every estimator, each from its own τ², the REML rows carry I2_tau, Begg says which p', async () => {
    const res = await anonymous(t.app).post('/api/syntheses').send({ ...base, method: 'REML' });
    expect(res.status).toBe(200);
    const rows = res.body.rows as Array<{ effect: number; variance: number }>;
    const est = res.body.estimators as Array<{ method: string; label: string; tau2: number | null; I2: number }>;
    expect(est.map((e) => [e.method, e.label])).toEqual([['FE', 'Fixed effect'], ['DL', 'DerSimonian–Laird'], ['REML', 'REML'], ['PM', 'Paule–Mandel']]);
    for (const e of est) {
      const r = pool({ effects: rows.map((x) => x.effect), variances: rows.map((x) => x.variance), method: e.method as 'FE' });
      expect(e.I2).toBe(e.method === 'REML' || e.method === 'PM' ? r.I2_tau : r.I2);
      expect(e.tau2).toBe(r.tau2);
    }
    expect(res.body.leaveOneOut.every((r: { I2_tau: number | null }) => typeof r.I2_tau === 'number')).toBe(true);
    expect(res.body.cumulative.slice(1).every((r: { I2_tau: number | null }) => typeof r.I2_tau === 'number')).toBe(true);
    const b = begg({ effects: rows.map((x) => x.effect), variances: rows.map((x) => x.variance) })!;
    expect(res.body.begg).toEqual({ tau: b.tau, z: b.z, p: b.p, p_method: b.p_method });
  });

  it('says the three-level model does not fit several moderators or one shared τ², and runs the rest', async () => {
    const res = await anonymous(t.app)
      .post('/api/syntheses')
      .send({ ...base, dependence: { mode: 'multilevel', robust: true }, moderators: ['year'], subgroup: 'modality', subgroupTau2: 'pooled' });
    expect(res.status).toBe(200);
    expect(res.body.regression).toBeNull();
    expect(res.body.estimators).toBeNull();
    const names = res.body.unavailable.map((u: { analysis: string }) => u.analysis);
    expect(names).toContain('meta-regression on several moderators');
    expect(names).toContain('one τ² shared by all subgroups');
  });

  it('names a moderator that cannot be fitted in words, and refuses bad choices with 400 at the field', async () => {
    const one = await anonymous(t.app).post('/api/syntheses').send({ ...base, moderators: ['task'] });
    expect(one.status).toBe(200);
    expect(one.body.regression).toBeNull();
    expect(one.body.unavailable).toContainEqual({ analysis: 'meta-regression on several moderators', reason: expect.stringMatching(/^Task takes only one value among these studies \(.+\): leave it out/) });

    for (const [body, path] of [
      [{ ...base, moderators: ['year', 'year'] }, 'body.moderators'],
      [{ ...base, moderators: ['weight'] }, 'body.moderators.0'],
      [{ ...base, moderators: [] }, 'body.moderators'],
      [{ ...base, subgroup: 'task', subgroupTau2: 'common' }, 'body.subgroupTau2'],
    ] as const) {
      const res = await anonymous(t.app).post('/api/syntheses').send(body);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.details.map((d: { path: string }) => d.path)).toContain(path);
    }
  });

  it('a snapshot keeps the analyses and its methods say how they were run', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const saved = await reviewer.post('/api/snapshots').send({ ...base, method: 'PM', hksj: true, moderators: ['standardMs', 'modality'], subgroup: 'modality', subgroupTau2: 'pooled' });
    expect(saved.status).toBe(201);
    const snap = await anonymous(t.app).get(`/api/snapshots/${saved.body.id}`);
    expect(snap.body.regression.terms).toHaveLength(3);
    expect(snap.body.subgroups.tau2Model).toBe('pooled');
    expect(snap.body.methods).toMatch(/meta-regression on standard duration \(ms\) and modality at once/);
    expect(snap.body.methods).toMatch(/Knapp–Hartung t tests on k − p degrees of freedom and an F test/);
    expect(snap.body.methods).toMatch(/one τ² shared by all subgroups, tested by the Knapp–Hartung F test/);
    expect(snap.body.methods).toMatch(/I² and H² from the Paule–Mandel τ²/);
    expect(snap.body.methods).toMatch(/exact p of Kendall's statistic/);
  });
});
