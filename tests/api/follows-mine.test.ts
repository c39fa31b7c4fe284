import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

const luminance = { request: { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false }, seShare: 0.25 };
const pitch = { request: { filters: { manipulation: ['pitch', 'luminance'], yearFrom: 2000 }, method: 'REML', hksj: true } };

describe("one's own follows: list and stop without the mail's link", () => {
  let t: TestApp;
  let reader: Agent;
  let other: Agent;
  const ids: number[] = [];
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    reader = await signIn(t.app, 'reader');
    other = await signIn(t.app, 'coder1');
    for (const b of [luminance, pitch]) {
      const res = await reader.post('/api/follows').send(b);
      expect(res.status).toBe(201);
      ids.push(res.body.id);
    }
    expect((await other.post('/api/follows').send(pitch)).status).toBe(201);
  });
  afterAll(() => t.close());

  it('lists only the caller\'s follows, oldest first, with thresholds and the request in words', async () => {
    const res = await reader.get('/api/follows');
    expect(res.status).toBe(200);
    expect(res.body.items.map((f: { id: number }) => f.id)).toEqual(ids);
    const [first, second] = res.body.items;
    expect(first).toMatchObject({ seShare: 0.25, weightShare: 0.2, feedUrl: `${process.env.APP_ORIGIN}/api/follows/${ids[0]}/feed.atom` });
    expect(first.request.filters).toEqual(luminance.request.filters);
    expect(first.summary).toBe("Manipulation: Luminance; Outcome kind: Duration distortion; Metric: Hedges' g_s (independent groups) — DerSimonian–Laird; effects within a study combined with r = 0.50");
    expect(second).toMatchObject({ seShare: 0.5, weightShare: 0.2 });
    expect(second.summary).toBe('Manipulation: Pitch, Luminance; years 2000–… — REML with HKSJ; effects within a study combined with r = 0.50');
    const theirs = await other.get('/api/follows');
    expect(theirs.body.items).toHaveLength(1);
    expect(theirs.body.items[0].id).not.toBe(ids[0]);
  });

  it('signed out is 401; another user stopping it is 404 and leaves it in place', async () => {
    const out = await anonymous(t.app).delete(`/api/follows/${ids[0]}`);
    expect(out.status).toBe(401);
    expect(out.body.error.code).toBe('unauthorized');
    expect((await anonymous(t.app).get('/api/follows')).status).toBe(401);
    const theirs = await other.delete(`/api/follows/${ids[0]}`);
    expect(theirs.status).toBe(404);
    expect(theirs.body.error.message).toMatch(new RegExp(`id ${ids[0]}`));
    expect(await t.ctx.db('follows').where({ id: ids[0] }).first()).toBeDefined();
    expect((await reader.delete('/api/follows/abc')).status).toBe(400);
  });

  it('the follower stops one: 204, gone from the list, a second stop is 404', async () => {
    const res = await reader.delete(`/api/follows/${ids[0]}`);
    expect(res.status).toBe(204);
    expect((await reader.get('/api/follows')).body.items.map((f: { id: number }) => f.id)).toEqual([ids[1]]);
    expect(await t.ctx.db('follows').where({ id: ids[0] }).first()).toBeUndefined();
    expect((await reader.delete(`/api/follows/${ids[0]}`)).status).toBe(404);
    expect((await other.get('/api/follows')).body.items).toHaveLength(1);
  });
});
