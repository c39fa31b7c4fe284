import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';
import { recheckFollows } from '../../server/services/following.js';

const body = { request: { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } } };

/** The Atom shape RFC 4287 asks for: feed with id, title, updated, author; each entry with id, title, updated. */
function atomEntries(xml: string): string[] {
  expect(xml.startsWith('<?xml version="1.0" encoding="utf-8"?>\n<feed xmlns="http://www.w3.org/2005/Atom">')).toBe(true);
  const head = xml.split('<entry>')[0];
  for (const tag of ['id', 'title', 'updated']) expect(head).toMatch(new RegExp(`<${tag}>[^<]+</${tag}>`));
  expect(head).toMatch(/<author><name>[^<]+<\/name><\/author>/);
  expect(xml.trimEnd().endsWith('</feed>')).toBe(true);
  const entries = [...xml.matchAll(/<entry>([\s\S]*?)<\/entry>/g)].map((m) => m[1]);
  for (const e of entries) for (const tag of ['id', 'title', 'updated']) expect(e).toMatch(new RegExp(`<${tag}>[^<]+</${tag}>`));
  return entries;
}

describe('following a synthesis', () => {
  let t: TestApp;
  let reader: Agent;
  let follow: { id: number; feedUrl: string };
  const deps = () => ({ db: t.ctx.db, jobs: null, appOrigin: process.env.APP_ORIGIN! });
  const followMails = () => t.ctx.db('mail_log').where({ kind: 'follow' }).select('to_address', 'body');
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    reader = await signIn(t.app, 'reader');
  });
  afterAll(() => t.close());

  it('anyone signed in follows: 201 with a feed readable signed out (no entries yet)', async () => {
    const res = await reader.post('/api/follows').send(body);
    expect(res.status).toBe(201);
    follow = res.body;
    expect(follow.feedUrl).toBe(`${process.env.APP_ORIGIN}/api/follows/${follow.id}/feed.atom`);
    const feed = await request(t.app).get(`/api/follows/${follow.id}/feed.atom`);
    expect(feed.status).toBe(200);
    expect(feed.type).toBe('application/atom+xml');
    expect(atomEntries(feed.text)).toHaveLength(0);
  });

  it('settling an effect that moves the estimate past the threshold: one mail and one feed entry', async () => {
    await settleInventedReference(t.ctx.db, 'luminance', 2024, [{ mean1: 900, mean2: 600, sd: 80, n: 150 }]);
    expect(await recheckFollows(deps())).toEqual({ checked: 1, rerun: 1, notified: 1 });
    const mails = await followMails();
    expect(mails).toHaveLength(1);
    expect(mails[0].body).toMatch(/The estimate moved by/);
    const entries = atomEntries((await request(t.app).get(`/api/follows/${follow.id}/feed.atom`)).text);
    expect(entries).toHaveLength(1);
    expect(entries[0]).toMatch(/estimate moved/);
  });

  it('settling one outside its filters: nothing re-run, no mail, no entry', async () => {
    await settleInventedReference(t.ctx.db, 'pitch', 2024, [{ mean1: 100, mean2: 600, sd: 80, n: 150 }]);
    expect(await recheckFollows(deps())).toEqual({ checked: 1, rerun: 0, notified: 0 });
    expect(await followMails()).toHaveLength(1);
    expect(atomEntries((await request(t.app).get(`/api/follows/${follow.id}/feed.atom`)).text)).toHaveLength(1);
  });

  it('a second crossing within a day: a feed entry but no second mail', async () => {
    await settleInventedReference(t.ctx.db, 'luminance', 2025, [{ mean1: 300, mean2: 600, sd: 80, n: 400 }]);
    expect((await recheckFollows(deps())).notified).toBe(1);
    expect(await followMails()).toHaveLength(1);
    expect(atomEntries((await request(t.app).get(`/api/follows/${follow.id}/feed.atom`)).text)).toHaveLength(2);
  });

  it('the mail\'s unsubscribe link works signed out; a bad token is a 400', async () => {
    const [mail] = await followMails();
    const link = new URL(/Unsubscribe: (\S+)/.exec(mail.body)![1]);
    const res = await request(t.app).get(link.pathname + link.search);
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ unsubscribed: true });
    expect(await t.ctx.db('follows').where({ id: follow.id }).first()).toBeUndefined();
    const bad = await request(t.app).get('/api/follows/unsubscribe?token=nope');
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBeTruthy();
  });

  it('refuses a follow signed out (401) and bad input (400); an unknown feed is 404', async () => {
    expect((await request(t.app).post('/api/follows').set('Origin', process.env.APP_ORIGIN!).send(body)).status).toBe(401);
    const bad = await reader.post('/api/follows').send({ ...body, seShare: -1 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toMatch(/seShare/);
    const missing = await request(t.app).get('/api/follows/99999/feed.atom');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBeTruthy();
    expect((await request(t.app).get('/api/follows/abc/feed.atom')).status).toBe(400);
  });
});
