import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pool } from '../../shared/stats/index.js';
import { seed as seedReferences } from '../../seeds/02_demo_references.js';
import { seed as seedRegistry } from '../../seeds/03_demo_registry.js';
import { querySettledEffects, querySynthesisRows } from '../../server/repositories/effects.js';
import { anonymous, createTestApp, resetDb, type TestApp } from '../support/test-app.js';

describe('synthesis over the seeded demo registry', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await seedReferences(t.ctx.db);
    await seedRegistry(t.ctx.db);
  }, 120_000);
  afterAll(() => t.close());

  it('equals the engine pool run directly on the answered rows, for every manipulation × outcome × metric cell', async () => {
    const atlas = await anonymous(t.app).get('/api/atlas');
    expect(atlas.body.totals.effects).toBeGreaterThanOrEqual(120);
    let cells = 0;
    for (const m of atlas.body.manipulations.filter((x: any) => x.effects > 0)) {
      const page = await anonymous(t.app).get(`/api/atlas/manipulations/${m.term}/pooled`);
      for (const cell of page.body.cells) {
        for (const method of ['DL', 'REML'] as const) {
          const res = await anonymous(t.app).post('/api/syntheses').send({ filters: cell.filters, method, hksj: false, dependence: { mode: 'aggregate', r: 0.5 } });
          expect(res.status).toBe(200);
          const direct = pool({ effects: res.body.rows.map((r: any) => r.effect), variances: res.body.rows.map((r: any) => r.variance), method, hksj: false });
          expect(res.body.result).toEqual(JSON.parse(JSON.stringify(direct)));
          if (method === 'DL') expect(cell.pooled.estimate).toBe(res.body.result.estimate);
          cells++;
        }
      }
    }
    expect(cells).toBeGreaterThanOrEqual(10);
  });

  it('the lean synthesis query answers the same rows as querySettledEffects, whatever the filters', async () => {
    const cases = [{}, { manipulation: 'luminance' }, { manipulation: ['numerosity', 'size'], metric: 'g_s' }, { outcome: 'simultaneity_window' }, { modality: 'auditory', yearFrom: 2010, yearTo: 2020 }, { manipulation: 'no_such_term' }];
    const keys = ['id', 'referenceId', 'studyId', 'studyLabel', 'referenceLabel', 'year', 'outcome', 'parameter', 'unit', 'fromBound', 'approximate', 'manipulation', 'manipulationLabel', 'metric', 'effect', 'variance', 'n', 'design', 'population', 'modality', 'task', 'standardMs'] as const;
    for (const f of cases) {
      const full = await querySettledEffects(t.ctx.db, f);
      const lean = await querySynthesisRows(t.ctx.db, f);
      expect(lean.length).toBe(full.length);
      expect(lean).toEqual(full.map((r) => Object.fromEntries(keys.map((k) => [k, r[k]]))));
    }
    expect((await querySynthesisRows(t.ctx.db, {})).length).toBeGreaterThanOrEqual(120);
  });

  it('refuses to pool several outcome kinds, and one outcome kind coded in two metrics without a metric filter', async () => {
    const facets = (await anonymous(t.app).get('/api/syntheses/facets')).body;
    expect(facets.outcomes.length).toBeGreaterThan(1);
    const all = await anonymous(t.app).post('/api/syntheses').send({ filters: {} });
    expect(all.status).toBe(422);
    for (const o of facets.outcomes) expect(all.body.error.details.outcomes).toContainEqual(expect.objectContaining({ outcome: o.value, count: o.count }));
    const metrics = new Map<string, number>();
    for (const e of await querySettledEffects(t.ctx.db, { outcome: 'duration_distortion' })) metrics.set(e.metric, (metrics.get(e.metric) ?? 0) + 1);
    expect(metrics.size).toBeGreaterThan(1);
    const res = await anonymous(t.app).post('/api/syntheses').send({ filters: { outcome: 'duration_distortion' } });
    expect(res.status).toBe(422);
    for (const [m, count] of metrics) expect(res.body.error.message).toContain(`${m}: ${count}`);
  });
});
