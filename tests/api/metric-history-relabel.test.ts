import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { up, down, standardizerOf } from '../../migrations/20261204300000_relabel_smd_history.js';
import { createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { insertReference } from './extraction-fixtures.js';

// Issue 11: discrepancy history and followed requests no longer say hedges_g (migration 20261204300000).
describe('relabelling hedges_g in discrepancy history and follows', () => {
  let t: TestApp;
  let ids: Map<string, number>;
  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
  });
  afterAll(() => t.close());

  it('names each old value by its standardizer from its form and r', () => {
    expect(standardizerOf({ form: 'smd', reported: { t: 2, n1: 10, n2: 10 } })).toBe('g_s');
    expect(standardizerOf({ form: 'smd_paired', reported: { mean_diff: 40, sd_diff: 80, n: 20, r: 0.7 } })).toBe('g_rm');
    expect(standardizerOf({ form: 'smd_paired', reported: { mean1: 1, sd1: 1, mean2: 0, sd2: 1, n: 20 }, assumedR: 0.5 })).toBe('g_av');
    expect(standardizerOf({ form: 'smd_paired', reported: { t: 2.4, n: 20 } })).toBe('g_z');
    expect(() => standardizerOf({ form: 'log_ratio', reported: {} })).toThrow(/hedges_g/);
  });

  it('relabels values, keeps everything else, and down() restores hedges_g', async () => {
    const db = t.ctx.db;
    await down(db); // the test database is migrated: step back to before this migration, then store old-style rows
    const ref = await insertReference(db, { firstAuthor: 'Oldkey', year: 2020 });
    const [a] = await db('assignments')
      .insert({ reference_id: ref, coder1_id: ids.get('coder1'), coder2_id: ids.get('coder2'), assigned_by: ids.get('curator') })
      .returning('id');
    const v = (form: string, reported: object, effect: number) => ({ form, reported, assumedR: null, metric: 'hedges_g', effect, variance: 0.1 });
    await db('discrepancies').insert({
      assignment_id: a.id, path: 'studies.0.effects.0.effect', field: 'effect', label: 'Study 1, effect 1: effect size',
      value_a: JSON.stringify(v('smd_paired', { t: 2.4, n: 20 }, 0.5)), value_b: JSON.stringify(v('smd_paired', { t: 2.4, n: 20, r: 0.8 }, 0.3)),
      status: 'resolved', resolution: 'b', resolved_value: JSON.stringify(v('smd_paired', { t: 2.4, n: 20, r: 0.8 }, 0.3)),
    });
    await db('discrepancies').insert({ assignment_id: a.id, path: 'studies.0.design', field: 'design', label: 'Study 1: design', value_a: '"within"', value_b: '"between"' });
    const request = { filters: { manipulation: 'luminance', metric: 'hedges_g' }, estimator: 'REML' };
    const [f] = await db('follows').insert({ user_id: ids.get('reviewer'), request: JSON.stringify(request), unsubscribe_token: 'relabel-test' }).returning('id');
    const [other] = await db('follows')
      .insert({ user_id: ids.get('reviewer'), request: JSON.stringify({ filters: { metric: 'log_ratio' } }), unsubscribe_token: 'relabel-test-2' })
      .returning('id');
    const before = await db('discrepancies').orderBy('id');

    await up(db);
    const [d, design] = await db('discrepancies').orderBy('id');
    expect([d.value_a.metric, d.value_b.metric, d.resolved_value.metric]).toEqual(['g_z', 'g_rm', 'g_rm']);
    expect({ ...d.value_a, metric: 'hedges_g' }).toEqual(before[0].value_a);
    expect(design).toEqual(before[1]);
    expect((await db('follows').where({ id: f.id }).first()).request).toEqual({ filters: { manipulation: 'luminance' }, estimator: 'REML', smdFamily: 'raw_score' });
    expect((await db('follows').where({ id: other.id }).first()).request).toEqual({ filters: { metric: 'log_ratio' } });

    await down(db);
    expect(await db('discrepancies').orderBy('id')).toEqual(before);
    expect((await db('follows').where({ id: f.id }).first()).request).toEqual(request);
    await up(db); // leave the schema as the migrations left it
  });
});
