import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as migration from '../../migrations/20261205300200_add_effect_bound_approximate.js';
import { computeEffect } from '../../shared/stats/compute-effect.js';
import { filterAttribution } from '../../shared/synthesis/flow.js';
import { querySynthesisRows } from '../../server/repositories/effects.js';
import { filterSettledEffects } from '../../server/services/settled-effects-cache.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';
import { settleInventedReference } from './syntheses-fixtures.js';

// Effects computed from a bound (p < .001) or from medians (Wan et al. 2014) say so, and a synthesis may leave them out (issue 11).
describe('effects from a bound or approximate', () => {
  let t: TestApp;
  let coder: Agent;
  const bound = { p_less_than: 0.001, n1: 20, n2: 20, direction: 1 };
  const medians = { median1: 640, lower_quartile1: 590, upper_quartile1: 700, n1: 20, median2: 600, lower_quartile2: 550, upper_quartile2: 655, n2: 20 };

  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    for (const [i, reported] of [undefined, undefined, bound, medians].entries())
      await settleInventedReference(t.ctx.db, 'numerosity', 2010 + i, [{ mean1: 650 + i * 5, mean2: 600, sd: 80, n: 20, ...(reported ? { reported } : {}) }]);
  });
  afterAll(() => t.close());

  it('the sheet keeps a p bound and medians, and the server flags the effects it computes from them', async () => {
    const refId = await insertReference(t.ctx.db, { firstAuthor: 'Abernathy', year: 2021 });
    const { body } = await coder.post('/api/extractions').send({ referenceId: refId });
    const sheet = luminanceSheet();
    const first = sheet.studies![0].effects![0];
    sheet.studies![0].effects = [
      { ...first, reported: bound },
      { ...first, reported: medians },
      first,
    ];
    const saved = await coder.put(`/api/extractions/${body.id}`).send({ version: 1, sheet });
    expect(saved.status).toBe(200);
    const [b, m, plain] = saved.body.studies[0].effects;
    expect(b.reported).toEqual(bound);
    expect(b.computed).toMatchObject({ metric: 'g_s', fromBound: true, approximate: false, formula: computeEffect({ measure: 'smd', ...bound }).formula });
    expect(b.computed.effect).toBeCloseTo(computeEffect({ measure: 'smd', ...bound }).effect, 12);
    expect(m.computed).toMatchObject({ fromBound: false, approximate: true, formula: 'smd.ind.means.medians' });
    expect(m.computed.effect).toBeCloseTo(computeEffect({ measure: 'smd', ...medians }).effect, 12);
    expect(plain.computed).toMatchObject({ fromBound: false, approximate: false });
  });

  it('a synthesis leaves out effects from a bound, approximate ones, or both, and the methods paragraph says so', async () => {
    const post = (filters: object) => anonymous(t.app).post('/api/syntheses').send({ filters: { manipulation: 'numerosity', ...filters } });
    expect((await post({})).body.counts.effects).toBe(4);
    expect((await post({ excludeBound: true })).body.counts.effects).toBe(3);
    expect((await post({ excludeApproximate: true })).body.counts.effects).toBe(3);
    const both = await post({ excludeBound: true, excludeApproximate: true });
    expect(both.body.counts.effects).toBe(2);
    // the synthesis flow counts each reference left out under its own step
    const effects = await querySynthesisRows(t.ctx.db, { manipulation: 'numerosity' });
    expect(filterAttribution(effects, { excludeBound: true, excludeApproximate: true }, filterSettledEffects)).toEqual({ bound: 1, approximate: 1 });
    const rows = await anonymous(t.app).get('/api/effects?manipulation=numerosity');
    expect(rows.body.items.map((r: any) => [r.fromBound, r.approximate])).toEqual([[false, false], [false, false], [true, false], [false, true]]);

    // the same from PostgreSQL (a live export reads in one transaction, not from the cache)
    const request = { filters: { manipulation: 'numerosity', excludeBound: true, excludeApproximate: true } };
    const csv = await anonymous(t.app).get(`/api/syntheses/export/effects.csv?request=${encodeURIComponent(JSON.stringify(request))}`);
    expect(csv.status).toBe(200);
    expect(csv.text.trim().split('\n')).toHaveLength(3);

    const reviewer = await signIn(t.app, 'reviewer');
    const snap = await reviewer.post('/api/snapshots').send(request);
    expect(snap.status).toBe(201);
    const view = await anonymous(t.app).get(`/api/snapshots/${snap.body.id}`);
    expect(view.body.methods).toMatch(/Effects computed from a reported bound \(p below a value\) and effects whose means and SDs were estimated from medians with quartiles or range \(Wan, Wang, Liu & Tong, 2014\) were left out\./);
    const plain = await reviewer.post('/api/snapshots').send({ filters: { manipulation: 'numerosity' } });
    expect((await anonymous(t.app).get(`/api/snapshots/${plain.body.id}`)).body.methods).not.toMatch(/were left out/);
  });

  it('refuses a flag that is not true or false by name; only reviewers save snapshots with it', async () => {
    const bad = await anonymous(t.app).post('/api/syntheses').send({ filters: { excludeBound: 'yes' } });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path)).toContain('body.filters.excludeBound');
    const request = { filters: { manipulation: 'numerosity', excludeBound: true } };
    expect((await coder.post('/api/snapshots').send(request)).status).toBe(403);
    expect((await anonymous(t.app).post('/api/snapshots').send(request)).status).toBe(401);
  });

  it('the migration adds both flags false for every stored effect, and goes down again', async () => {
    await migration.down(t.ctx.db);
    expect(await t.ctx.db.schema.hasColumn('effects', 'from_bound')).toBe(false);
    await migration.up(t.ctx.db);
    expect(new Set(await t.ctx.db('effects').pluck('from_bound'))).toEqual(new Set([false]));
    expect(new Set(await t.ctx.db('effects').pluck('approximate'))).toEqual(new Set([false]));
  });
});
