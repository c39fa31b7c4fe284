import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { seed } from '../../seeds/03_demo_registry.js';
import { countSettledEffects, querySettledEffects } from '../../server/repositories/effects.js';
import { computeReported } from '../../shared/extraction/compute.js';
import { atlasLanding } from '../../server/services/atlas.js';
import { createTestApp, resetDb, type TestApp } from '../support/test-app.js';

describe('demo registry seed', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await seed(t.ctx.db);
  });
  afterAll(() => t.close());

  it('makes a believable registry: ~40 included references, 120+ settled effects, a reconciliation queue and drafts', async () => {
    const refs = await t.ctx.db('refs').where({ screening_status: 'included' }).count<{ c: number }[]>({ c: '*' });
    expect(Number(refs[0].c)).toBeGreaterThanOrEqual(40);
    expect(await countSettledEffects(t.ctx.db)).toBeGreaterThanOrEqual(120);
    expect((await t.ctx.db('assignments').where({ state: 'disputed' })).length).toBeGreaterThanOrEqual(3);
    expect((await t.ctx.db('extractions').where({ kind: 'coding', state: 'draft' })).length).toBeGreaterThanOrEqual(2);
    const manipulations = new Set((await querySettledEffects(t.ctx.db)).map((r) => r.manipulation));
    expect(manipulations.size).toBe(16);
    const outcomes = new Set((await querySettledEffects(t.ctx.db)).map((r) => r.outcome));
    expect(outcomes.size).toBe(6);
  });

  it('stores numbers consistent with the engine and realistic magnitudes', async () => {
    const rows = await t.ctx.db('effects as f').join('extractions as x', 'x.id', 'f.extraction_id').where('x.kind', 'settled').select('f.*');
    for (const r of rows) {
      const c = computeReported(r.report_form, r.reported, r.assumed_r);
      // a bisection point shift is reversed to keep duration distortion's sign convention (lower = longer)
      expect(r.effect).toBeCloseTo(r.sign_reversed ? -c.effect : c.effect, 10);
      expect(r.variance).toBeCloseTo(c.variance, 10);
    }
    const g = await querySettledEffects(t.ctx.db, { metric: ['g_s', 'g_av', 'g_rm', 'g_z'], outcome: 'duration_distortion' });
    expect(g.every((r) => Math.abs(r.effect) < 1.5)).toBe(true);
    const windows = await querySettledEffects(t.ctx.db, { outcome: 'simultaneity_window' });
    expect(windows.every((r) => r.effect >= 150 && r.effect <= 450)).toBe(true);
    expect((await querySettledEffects(t.ctx.db, { manipulation: 'luminance', metric: ['g_s', 'g_av', 'g_rm', 'g_z'] })).length).toBeGreaterThanOrEqual(8);
  });

  it('draws heterogeneity per lab, records every parameter and unit, and has percent units and reversed signs', async () => {
    const rows = await querySettledEffects(t.ctx.db);
    expect(rows.every((r) => r.parameter && r.unit)).toBe(true);
    const percent = rows.filter((r) => r.unit === 'percent');
    expect(percent.length).toBeGreaterThanOrEqual(3);
    expect(percent.every((r) => r.metric === 'log_ratio' && r.parameter === 'duration_ratio')).toBe(true);
    const reversed = rows.filter((r) => r.signReversed);
    expect(reversed.length).toBeGreaterThanOrEqual(3);
    // a lower bisection point under threat means lengthening: stored positive
    expect(reversed.every((r) => r.parameter === 'bisection_point' && r.task === 'bisection' && r.effect > 0)).toBe(true);
    // within-subject effects with r are raw-score g_rm; a paired t alone stays g_z
    expect(rows.some((r) => r.metric === 'g_rm') && rows.some((r) => r.metric === 'g_z')).toBe(true);
    // between-lab differences: most pools of 3+ studies have a between-study variance (DerSimonian–Laird, as the atlas pools)
    const cells = (await atlasLanding(t.ctx.db)).manipulations.flatMap((m) => m.estimates).filter((c) => c.counts.studies >= 3);
    expect(cells.length).toBeGreaterThanOrEqual(8);
    expect(cells.filter((c) => (c.pooled.tau2 ?? 0) > 0).length).toBeGreaterThan(cells.length / 2);
  });

  it('is idempotent: a second run adds nothing', async () => {
    const before = await countSettledEffects(t.ctx.db);
    const refs = await t.ctx.db('refs').count<{ c: number }[]>({ c: '*' });
    await seed(t.ctx.db);
    expect(await countSettledEffects(t.ctx.db)).toBe(before);
    expect(await t.ctx.db('refs').count<{ c: number }[]>({ c: '*' })).toEqual(refs);
  });
});
