import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { querySynthesisRows } from '../../server/repositories/effects.js';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { filterSettledEffects, settledEffectsAt, settledEffectsFor } from '../../server/services/settled-effects-cache.js';
import { anonymous, createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

describe('settled effects held in memory per registry version', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    await settleInventedSet(t.ctx.db, 'numerosity');
  }, 120_000);
  afterAll(() => t.close());

  it('filters in memory to exactly the rows the database query answers', async () => {
    const { effects } = await settledEffectsAt(t.ctx.db);
    const cases = [
      {},
      { manipulation: 'luminance' },
      { manipulation: ['luminance', 'numerosity'], metric: 'g_s' as const },
      { manipulation: ['numerosity', 'luminance', 'numerosity'] },
      { modality: 'auditory', yearFrom: 2008, yearTo: 2012 },
      { yearFrom: 2014 },
      { manipulation: 'no_such_term' },
      { outcome: 'simultaneity_window' },
    ];
    for (const f of cases) {
      const fromDb = await querySynthesisRows(t.ctx.db, f);
      expect(filterSettledEffects(effects, f)).toEqual(fromDb);
      expect((await settledEffectsFor(t.ctx.db, f)).effects).toEqual(fromDb);
    }
    expect(filterSettledEffects(effects, { manipulation: 'luminance' }).length).toBeGreaterThanOrEqual(12);
  });

  it('reloads when the registry version moves, so a new settled effect enters the next synthesis', async () => {
    const before = await settledEffectsFor(t.ctx.db, { manipulation: 'luminance' });
    expect(before.registryVersion).toBe(await currentRegistryVersion(t.ctx.db));
    const body = { filters: { manipulation: 'luminance' }, smdFamily: 'raw_score', method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
    const first = await anonymous(t.app).post('/api/syntheses').send(body);
    expect(first.status).toBe(200);

    await settleInventedReference(t.ctx.db, 'luminance', 2024, [{ mean1: 900, mean2: 600, sd: 90, n: 30 }]);
    const after = await settledEffectsFor(t.ctx.db, { manipulation: 'luminance' });
    expect(after.registryVersion).toBeGreaterThan(before.registryVersion);
    expect(after.effects.length).toBe(before.effects.length + 1);
    const second = await anonymous(t.app).post('/api/syntheses').send(body);
    expect(second.body.rows.length).toBe(first.body.rows.length + 1);
    expect(second.body.result.estimate).toBeGreaterThan(first.body.result.estimate);
  });

  it('answers concurrent first requests from one load', async () => {
    const fresh = await createTestApp();
    try {
      const [a, b] = await Promise.all([settledEffectsAt(fresh.ctx.db), settledEffectsAt(fresh.ctx.db)]);
      expect(a).toBe(b);
    } finally {
      await fresh.close();
    }
  });
});
