import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { querySettledEffects } from '../../server/repositories/effects.js';
import { DEFAULT_MANIPULATIONS } from '../../server/services/manipulations.js';
import { createSettledRecord } from '../../server/services/settlement.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

describe('manipulation vocabulary', () => {
  let t: TestApp;
  let curator: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    const ref = await insertReference(t.ctx.db);
    await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: ref, sheet: luminanceSheet() }));
    curator = await signIn(t.app, 'curator');
  });
  afterAll(() => t.close());

  it('lists the seeded vocabulary with term, label and settled counts', async () => {
    const res = await anonymous(t.app).get('/api/manipulations?sort=term');
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(DEFAULT_MANIPULATIONS.length);
    expect(res.body.items.map((m: any) => m.term)).toEqual(expect.arrayContaining(['luminance', 'delay_adaptation', 'voluntary_action', 'novelty_oddball']));
    expect(res.body.items.find((m: any) => m.term === 'luminance')).toMatchObject({ label: 'Luminance', settledEffects: 1, retired: false });
  });

  it('curators add, rename and retire terms without breaking coded effects', async () => {
    const created = await curator.post('/api/manipulations').send({ term: 'colour_saturation', label: 'Colour saturation' });
    expect(created.status).toBe(201);
    expect((await curator.post('/api/manipulations').send({ term: 'colour_saturation', label: 'Again' })).status).toBe(409);
    const lum = (await anonymous(t.app).get('/api/manipulations')).body.items.find((m: any) => m.term === 'luminance');
    const renamed = await curator.patch('/api/manipulations/luminance').send({ version: lum.version, label: 'Luminance (brightness)' });
    expect(renamed.status).toBe(200);
    const stale = await curator.patch('/api/manipulations/luminance').send({ version: lum.version, retired: true });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed by curator/);
    const retired = await curator.patch('/api/manipulations/luminance').send({ version: renamed.body.manipulation.version, retired: true });
    expect(retired.body.manipulation.retired).toBe(true);
    const visible = await anonymous(t.app).get('/api/manipulations');
    expect(visible.body.items.some((m: any) => m.term === 'luminance')).toBe(false);
    const all = await anonymous(t.app).get('/api/manipulations?includeRetired=true');
    expect(all.body.items.some((m: any) => m.term === 'luminance')).toBe(true);
    const [effect] = await querySettledEffects(t.ctx.db, { manipulation: 'luminance' });
    expect(effect).toMatchObject({ manipulation: 'luminance', manipulationLabel: 'Luminance (brightness)' });
  });
});
