import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { clearSearch } from '../support/references.js';
import { rebuildInBackground, rebuildReferenceIndex } from '../../server/services/search.js';
import { markIndexStale } from '../../server/repositories/search-index-builds.js';
import { REFERENCES_INDEX } from '../../server/adapters/search.js';
import { settleInventedReference } from './syntheses-fixtures.js';

const study = { mean1: 650, mean2: 600, sd: 90, n: 16 };
type Hit = { id: number; manipulations: { term: string; label: string }[]; outcomes: string[]; tasks: string[]; records: number[] };

describe('search by what settled effects cover', () => {
  let t: TestApp;
  let curator: Agent;
  const ref: Record<string, { referenceId: number; recordId: number }> = {};
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await clearSearch(t);
    curator = await signIn(t.app, 'curator');
    ref.lum = await settleInventedReference(t.ctx.db, 'luminance', 2011, [study]);
    ref.num = await settleInventedReference(t.ctx.db, 'numerosity', 2014, [study]);
    ref.sim = await settleInventedReference(t.ctx.db, 'luminance', 2019, [study], 'temporal_order');
    await rebuildReferenceIndex(t.ctx.db, t.ctx.search!);
  });
  afterAll(async () => {
    await t.close();
  });

  const search = (qs: string) => anonymous(t.app).get(`/api/search?${qs}`);
  const ids = (body: { hits: Hit[] }) => body.hits.map((h) => h.id).sort((a, b) => a - b);

  it('filters by manipulation, outcome kind and task through the index, and each hit names its settled records and manipulations', async () => {
    const lum = await search('manipulation=luminance');
    expect(lum.status).toBe(200);
    expect(lum.body.source).toBe('index');
    expect(ids(lum.body)).toEqual([ref.lum.referenceId, ref.sim.referenceId].sort((a, b) => a - b));
    const hit = lum.body.hits.find((h: Hit) => h.id === ref.lum.referenceId) as Hit;
    expect(hit.manipulations).toEqual([{ term: 'luminance', label: expect.any(String) }]);
    expect(hit.manipulations[0].label).not.toMatch(/_/);
    expect(hit.outcomes).toEqual(['duration_distortion']);
    expect(hit.tasks).toEqual(['reproduction']);
    expect(hit.records).toEqual([ref.lum.recordId]);

    expect(ids((await search('manipulation=luminance&outcome=duration_distortion')).body)).toEqual([ref.lum.referenceId]);
    expect(ids((await search('outcome=temporal_order')).body)).toEqual([ref.sim.referenceId]);
    expect((await search('task=reproduction')).body.total).toBe(3);
    expect((await search('task=bisection')).body.total).toBe(0);
    expect(ids((await search('q=numerosity&task=reproduction')).body)).toEqual([ref.num.referenceId]);
  });

  it('a withdrawn record leaves the filters at the next search (the registry moved), and a new settlement enters them', async () => {
    const withdrawn = await curator.post(`/api/records/${ref.num.recordId}/withdraw`).send({ reason: 'Invented reason: the counts were misread' });
    expect(withdrawn.status).toBe(200);
    const after = await search('manipulation=numerosity');
    expect(after.body.source).toBe('index');
    expect(after.body.total).toBe(0);
    const plain = await search('q=numerosity');
    expect((plain.body.hits as Hit[]).find((h) => h.id === ref.num.referenceId)?.records).toEqual([]);

    const fresh = await settleInventedReference(t.ctx.db, 'numerosity', 2022, [study]);
    const now = await search('manipulation=numerosity');
    expect(ids(now.body)).toEqual([fresh.referenceId]);
    expect((now.body.hits as Hit[])[0].records).toEqual([fresh.recordId]);
  });

  it('answers the same filters from PostgreSQL while the index is rebuilt', async () => {
    await markIndexStale(t.ctx.db, REFERENCES_INDEX);
    const res = await search('manipulation=luminance&outcome=temporal_order');
    expect(res.body.source).toBe('database');
    expect(ids(res.body)).toEqual([ref.sim.referenceId]);
    expect((res.body.hits as Hit[])[0]).toMatchObject({ outcomes: ['temporal_order'], tasks: ['reproduction'], records: [ref.sim.recordId] });
    expect((await search('task=reproduction&manipulation=numerosity')).body.total).toBe(1);
    await rebuildInBackground({ db: t.ctx.db, search: t.ctx.search! });
  });

  it('refuses a filter outside the vocabulary with a message in words', async () => {
    const bad = await search('outcome=duration');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { message: string }) => d.message)).toContain('choose an outcome kind from the list');
    const term = await search('manipulation=Bright%20Flash');
    expect(term.status).toBe(400);
    expect(term.body.error.details[0].message).toMatch(/by its term from the vocabulary/);
  });
});
