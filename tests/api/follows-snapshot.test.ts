import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';
import { recheckFollows } from '../../server/services/following.js';
import { recheckSnapshots } from '../../server/services/snapshot-changes.js';

const request = { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };

const entriesOf = (xml: string) => [...xml.matchAll(/<entry>([\s\S]*?)<\/entry>/g)].map((m) => m[1]);

describe('following a snapshot, and a snapshot against today’s registry', () => {
  let t: TestApp;
  let reader: Agent;
  let other: Agent;
  let snapshot: { id: string; registryVersion: number };
  let snapshotK: number;
  let follow: { id: number; snapshotId: string; changesUrl: string };
  const deps = () => ({ db: t.ctx.db, jobs: null, appOrigin: process.env.APP_ORIGIN! });
  const feed = async () => {
    const res = await anonymous(t.app).get(`/api/snapshots/${snapshot.id}/feed.atom`);
    expect(res.status).toBe(200);
    expect(res.type).toBe('application/atom+xml');
    expect(res.text).toMatch(/^<\?xml version="1.0" encoding="utf-8"\?>\n<feed xmlns="http:\/\/www.w3.org\/2005\/Atom">/);
    return entriesOf(res.text);
  };
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    const reviewer = await signIn(t.app, 'reviewer');
    reader = await signIn(t.app, 'reader');
    other = await signIn(t.app, 'coder1');
    const saved = await reviewer.post('/api/snapshots').send(request);
    expect(saved.status).toBe(201);
    snapshot = saved.body;
    snapshotK = (await anonymous(t.app).get(`/api/snapshots/${snapshot.id}`)).body.result.k;
  });
  afterAll(() => t.close());

  it('anyone signed in follows a snapshot: its request, the snapshot named; either a request or a snapshot, never both', async () => {
    const res = await reader.post('/api/follows').send({ snapshotId: snapshot.id, seShare: 0.25 });
    expect(res.status).toBe(201);
    follow = res.body;
    expect(res.body).toMatchObject({ snapshotId: snapshot.id, seShare: 0.25, weightShare: 0.2, changesUrl: `${process.env.APP_ORIGIN}/follows/${follow.id}/changes` });
    expect(res.body.request.filters).toEqual(request.filters);
    const both = await reader.post('/api/follows').send({ request, snapshotId: snapshot.id });
    expect(both.status).toBe(400);
    expect(both.body.error.details[0].path).toMatch(/snapshotId/);
    const neither = await reader.post('/api/follows').send({ seShare: 0.5 });
    expect(neither.status).toBe(400);
    expect(neither.body.error.details[0].message).toBe('follow either a synthesis or a snapshot, one of the two');
    const unknown = await reader.post('/api/follows').send({ snapshotId: '0000000000000000' });
    expect(unknown.status).toBe(404);
    expect(unknown.body.error.message).toMatch(/No snapshot 0000000000000000/);
    expect((await anonymous(t.app).post('/api/follows').set('Origin', process.env.APP_ORIGIN!).send({ snapshotId: snapshot.id })).status).toBe(401);
  });

  it('a fresh snapshot: the diff shows nothing changed, its feed (signed out) has no entry', async () => {
    const diff = await anonymous(t.app).get(`/api/snapshots/${snapshot.id}/diff`);
    expect(diff.status).toBe(200);
    expect(diff.body.then).toMatchObject({ registryVersion: snapshot.registryVersion, k: snapshotK });
    expect(diff.body.now.k).toBe(snapshotK);
    expect(diff.body.now.estimate).toBeCloseTo(diff.body.then.estimate, 12);
    expect([diff.body.added, diff.body.withdrawn, diff.body.corrected]).toEqual([[], [], []]);
    expect(await feed()).toHaveLength(0);
  });

  it('a settlement outside its filters: no follow re-run, no snapshot feed entry', async () => {
    await settleInventedReference(t.ctx.db, 'pitch', 2024, [{ mean1: 100, mean2: 600, sd: 80, n: 150 }]);
    expect(await recheckFollows(deps())).toEqual({ checked: 1, rerun: 0, notified: 0 });
    expect(await recheckSnapshots(t.ctx.db)).toEqual({ checked: 1, changed: 0 });
    expect(await feed()).toHaveLength(0);
    expect((await anonymous(t.app).get(`/api/snapshots/${snapshot.id}/diff`)).body.added).toEqual([]);
  });

  it('a settlement that moves it: one mail linking the changes, one follow event, one snapshot feed entry, the diff names the effect', async () => {
    const added = await settleInventedReference(t.ctx.db, 'luminance', 2024, [{ mean1: 900, mean2: 600, sd: 80, n: 150 }]);
    expect(await recheckFollows(deps())).toEqual({ checked: 1, rerun: 1, notified: 1 });
    const mails = await t.ctx.db('mail_log').where({ kind: 'follow' }).select('body');
    expect(mails).toHaveLength(1);
    expect(mails[0].body).toMatch(new RegExp(`What changed: ${process.env.APP_ORIGIN}/follows/${follow.id}/changes\\?since=\\d+`));
    expect(await recheckSnapshots(t.ctx.db)).toEqual({ checked: 1, changed: 1 });
    expect(await recheckSnapshots(t.ctx.db)).toEqual({ checked: 0, changed: 0 });
    const entries = await feed();
    expect(entries).toHaveLength(1);
    expect(entries[0]).toMatch(/<title>Registry version \d+: 1 added, 0 withdrawn, 0 corrected since the snapshot<\/title>/);
    expect(entries[0]).toMatch(new RegExp(`k = ${snapshotK + 1}, estimate .* in the snapshot \\(registry version ${snapshot.registryVersion}\\) k = ${snapshotK}`));
    expect(entries[0]).toMatch(/The estimate moved by/);
    const diff = (await anonymous(t.app).get(`/api/snapshots/${snapshot.id}/diff`)).body;
    expect(diff.now.k).toBe(snapshotK + 1);
    expect(diff.then.k).toBe(snapshotK);
    expect(diff.added).toHaveLength(1);
    expect(diff.added[0].referenceId).toBe(added.referenceId);
    expect(diff.now.forest).toBeTruthy();
  });

  it('the follower sees what changed since: the snapshot then, the registry now, the effect added; others 404, signed out 401', async () => {
    const res = await reader.get(`/api/follows/${follow.id}/changes`);
    expect(res.status).toBe(200);
    const c = res.body;
    expect(c.follow.snapshotId).toBe(snapshot.id);
    expect(c.events).toHaveLength(1);
    expect(c.since.eventId).toBe(c.events[0].id);
    expect(c.events[0].text).toMatch(/The estimate moved by/);
    expect(c.then).toMatchObject({ k: snapshotK, registryVersion: snapshot.registryVersion });
    expect(c.now.k).toBe(snapshotK + 1);
    expect(c.then.forest).toBeTruthy();
    expect(c.now.forest).toBeTruthy();
    expect(c.added.map((e: { referenceLabel: string }) => e.referenceLabel)).toHaveLength(1);
    expect(c.effectsRecorded).toBe(true);
    expect((await reader.get(`/api/follows/${follow.id}/changes?since=${c.events[0].id}`)).body.added).toHaveLength(1);
    const theirs = await other.get(`/api/follows/${follow.id}/changes`);
    expect(theirs.status).toBe(404);
    expect(theirs.body.error.message).toMatch(/You follow nothing/);
    expect((await anonymous(t.app).get(`/api/follows/${follow.id}/changes`)).status).toBe(401);
    const noEntry = await reader.get(`/api/follows/${follow.id}/changes?since=999999`);
    expect(noEntry.status).toBe(404);
    expect(noEntry.body.error.message).toMatch(/Feed entry 999999/);
    expect((await reader.get(`/api/follows/${follow.id}/changes?since=soon`)).status).toBe(400);
  });
});
