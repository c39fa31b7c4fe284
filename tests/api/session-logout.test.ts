import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';

describe('signing out deletes the session', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
  });
  afterAll(() => t.close());

  it('POST /auth/logout removes the session row and the old cookie is refused afterwards', async () => {
    const agent = await signIn(t.app, 'coder1');
    const [jar] = agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false }).filter((c) => c.name === 'chronometa.sid');
    const cookie = `chronometa.sid=${jar.value}`;
    // the cookie is s:<sid>.<signature>
    const sid = /^s:([^.]+)\./.exec(decodeURIComponent(jar.value))?.[1];
    expect(sid).toBeTruthy();
    expect(await t.ctx.db('session').where({ sid }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    expect((await request(t.app).get('/api/me').set('Cookie', cookie)).status).toBe(200);

    const out = await agent.post('/auth/logout');
    expect(out.status).toBe(204);
    expect(String(out.headers['set-cookie'])).toMatch(/chronometa\.sid=;/);
    expect(await t.ctx.db('session').where({ sid }).count({ n: '*' }).first()).toMatchObject({ n: 0 });

    // replaying the cookie held before signing out
    const replay = await request(t.app).get('/api/me').set('Cookie', cookie);
    expect(replay.status).toBe(401);
    expect(replay.body.error.code).toBeTruthy();
    const write = await request(t.app).post('/api/tokens').set('Cookie', cookie).set('Origin', process.env.APP_ORIGIN!).send({ name: 'after' });
    expect(write.status).toBe(401);
    expect(await t.ctx.db('api_tokens').count({ n: '*' }).first()).toMatchObject({ n: 0 });
  });

  it('signing out one session leaves another session of the same user signed in', async () => {
    const first = await signIn(t.app, 'coder2');
    const second = await signIn(t.app, 'coder2');
    expect((await first.post('/auth/logout')).status).toBe(204);
    expect((await first.get('/api/me')).status).toBe(401);
    expect((await second.get('/api/me')).status).toBe(200);
  });
});
