import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { anonymous, createTestApp, origin, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

// Every write settled data or its filters can see bumps the registry version in its transaction, so the
// version-keyed caches (synthesis answers, atlas, in-memory settled effects) answer the new state at once.
describe('registry version: every write settled data can see', () => {
  let t: TestApp;
  let curator: Agent;
  let refs: Awaited<ReturnType<typeof settleInventedSet>>;
  const synth = (filters: Record<string, unknown>) =>
    anonymous(t.app).post('/api/syntheses').set('Origin', origin()).send({ filters: { manipulation: 'luminance', outcome: 'duration_distortion', ...filters } });

  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    refs = await settleInventedSet(t.ctx.db, 'luminance');
    curator = await signIn(t.app, 'curator');
  });
  afterAll(() => t.close());

  it('a reference’s year edit changes the synthesis and the atlas at once', async () => {
    const id = refs[0].referenceId;
    // warm every cache first
    const before = await synth({ yearFrom: 2005 });
    expect(before.status).toBe(200);
    const k0 = before.body.counts.references;
    const atlas0 = (await anonymous(t.app).get('/api/atlas/manipulations/luminance')).body;
    const refs0 = (await anonymous(t.app).get('/api/atlas/manipulations/luminance/references?sort=year&order=asc&pageSize=1')).body;
    expect(refs0.items[0]).toMatchObject({ id, year: 2005 });
    const v0 = await currentRegistryVersion(t.ctx.db);

    const cur = (await curator.get(`/api/references/${id}`)).body.reference;
    const edit = await curator.patch(`/api/references/${id}`).send({ version: cur.version, year: 1994 });
    expect(edit.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(v0 + 1);

    const after = await synth({ yearFrom: 2005 });
    expect(after.body.counts.references).toBe(k0 - 1);
    expect(after.body.registryVersion).toBe(v0 + 1);
    const all = await synth({});
    expect(all.body.counts.references).toBe(12);
    const atlas1 = (await anonymous(t.app).get('/api/atlas/manipulations/luminance')).body;
    expect(JSON.stringify(atlas1.cells[0].forest)).toContain('1994');
    expect(JSON.stringify(atlas0.cells[0].forest)).not.toContain('1994');
    const refs1 = (await anonymous(t.app).get('/api/atlas/manipulations/luminance/references?sort=year&order=asc&pageSize=1')).body;
    expect(refs1.items[0]).toMatchObject({ id, year: 1994 });
  });

  it('an author or title edit shows in the settled effects and the atlas labels', async () => {
    const id = refs[1].referenceId;
    await anonymous(t.app).get('/api/atlas/manipulations/luminance');
    const cur = (await curator.get(`/api/references/${id}`)).body.reference;
    const v0 = await currentRegistryVersion(t.ctx.db);
    const edit = await curator.patch(`/api/references/${id}`).send({ version: cur.version, authors: [{ family: 'Oakhollow', given: 'Rin' }], title: 'A retitled invented study' });
    expect(edit.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(v0 + 1);
    const atlas = (await anonymous(t.app).get('/api/atlas/manipulations/luminance')).body;
    expect(JSON.stringify(atlas.cells[0].forest)).toContain('Oakhollow');
    const effects = (await anonymous(t.app).get(`/api/effects?referenceId=${id}`)).body;
    expect(effects.registryVersion).toBe(v0 + 1);
    // an edit that changes nothing is not a change
    const same = await curator.patch(`/api/references/${id}`).send({ version: edit.body.version, title: 'A retitled invented study' });
    expect(same.body.changed).toEqual([]);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(v0 + 1);
  });

  it('a merge, a new term, a relabel and a retirement each bump the version, and the atlas shows them at once', async () => {
    const other = await settleInventedReference(t.ctx.db, 'loudness', 2019, [{ mean1: 620, mean2: 600, sd: 70, n: 20, modality: 'auditory' }]);
    const [plain] = await t.ctx.db('refs').insert({ csl: JSON.stringify({ title: 'Plain twin' }), title: 'Plain twin', title_key: 'plain twin', screening_status: 'included' }).returning('id');
    const landing0 = (await anonymous(t.app).get('/api/atlas')).body;
    let v = await currentRegistryVersion(t.ctx.db);

    const merged = await curator.post('/api/references/merge').set('Origin', origin()).send({ a: other.referenceId, b: plain.id, keep: other.referenceId });
    expect(merged.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(++v);

    const created = await curator.post('/api/manipulations').send({ term: 'colour_saturation', label: 'Colour saturation', description: 'More saturated hues.' });
    expect(created.status).toBe(201);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(++v);
    const landing1 = (await anonymous(t.app).get('/api/atlas')).body;
    expect(landing0.manipulations.some((m: { term: string }) => m.term === 'colour_saturation')).toBe(false);
    expect(landing1.manipulations.some((m: { term: string }) => m.term === 'colour_saturation')).toBe(true);

    const lum = (await anonymous(t.app).get('/api/manipulations?includeRetired=true&pageSize=100')).body.items.find((m: { term: string }) => m.term === 'luminance');
    const relabel = await curator.patch('/api/manipulations/luminance').send({ version: lum.version, label: 'Brightness' });
    expect(relabel.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(++v);
    const run = await synth({});
    expect(run.body.registryVersion).toBe(v);
    expect((await anonymous(t.app).get('/api/atlas')).body.manipulations.find((m: { term: string }) => m.term === 'luminance').label).toBe('Brightness');

    const sat = created.body.manipulation;
    const retire = await curator.patch('/api/manipulations/colour_saturation').send({ version: sat.version, retired: true });
    expect(retire.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(++v);
    expect((await anonymous(t.app).get('/api/atlas')).body.manipulations.some((m: { term: string }) => m.term === 'colour_saturation')).toBe(false);
  });
});
