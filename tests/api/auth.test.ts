import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { freePorts } from '../support/ports.js';
import { createTestApp, origin, resetDb, signIn, type TestApp } from '../support/test-app.js';

describe('sign-in through the OAuth protocol', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
  });
  afterAll(() => t.close());

  it('runs authorize → callback → token → profile → session, and /api/me shows the user and roles', async () => {
    const agent = request.agent(t.app);
    const start = await agent.get('/auth/github');
    expect(start.status).toBe(302);
    const authorize = new URL(start.headers.location);
    expect(authorize.origin).toBe(new URL(process.env.GITHUB_AUTHORIZATION_URL!).origin);
    expect(authorize.searchParams.get('client_id')).toBe(process.env.GITHUB_CLIENT_ID);
    expect(authorize.searchParams.get('scope')).toContain('user:email');
    const state = authorize.searchParams.get('state');
    expect(state).toBeTruthy();

    authorize.searchParams.set('login', 'curator');
    const provider = await fetch(authorize, { redirect: 'manual' });
    expect(provider.status).toBe(302);
    const callback = new URL(provider.headers.get('location')!);
    expect(callback.pathname).toBe('/auth/github/callback');
    expect(callback.searchParams.get('state')).toBe(state);

    const done = await agent.get(callback.pathname + callback.search);
    expect(done.status).toBe(302);
    expect(done.headers.location).toBe('/');
    const cookie = String(done.headers['set-cookie']);
    expect(cookie).toMatch(/chronometa\.sid=/);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);

    const me = await agent.get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body.user.login).toBe('curator');
    expect(me.body.user.name).toBe('Dario Okonkwo-Reyes');
    expect(me.body.user.email).toBe('dario.okonkwo@interval-group.example');
    expect(me.body.user.roles).toEqual(['curator', 'reader']);
    expect(me.body.user.effectiveRoles).toEqual(['reader', 'contributor', 'curator']);
  });

  it('refuses a callback whose state does not match the session', async () => {
    const agent = request.agent(t.app);
    const start = await agent.get('/auth/github');
    const authorize = new URL(start.headers.location);
    authorize.searchParams.set('login', 'reader');
    authorize.searchParams.set('state', 'forged-state');
    const provider = await fetch(authorize, { redirect: 'manual' });
    const callback = new URL(provider.headers.get('location')!);
    const done = await agent.get(callback.pathname + callback.search);
    expect(done.headers.location).toContain('signin=failed');
    expect((await agent.get('/api/me')).status).toBe(401);
  });

  it('gives a first-time identity the reader role and names admins by configuration', async () => {
    await t.ctx.db('users').where({ login: 'reader' }).delete();
    const agent = await signIn(t.app, 'reader');
    expect((await agent.get('/api/me')).body.user.roles).toEqual(['reader']);
    await t.ctx.db('user_roles').where({ role: 'admin' }).delete();
    const admin = await signIn(t.app, 'admin');
    expect((await admin.get('/api/me')).body.user.roles).toContain('admin');
    const audit = await t.ctx.db('audit_log').where({ action: 'role.granted' }).select('details');
    expect(audit.some((a) => a.details.reason === 'named in ADMIN_LOGINS')).toBe(true);
  });

  it('keeps a session valid after the app is rebuilt (sessions live in PostgreSQL)', async () => {
    const agent = await signIn(t.app, 'reviewer');
    const cookie = (await agent.get('/api/me')).request.getHeader?.('cookie');
    const jar = agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false });
    const sid = jar.find((c) => c.name === 'chronometa.sid');
    expect(sid ?? cookie).toBeTruthy();
    const rebuilt = await createTestApp();
    try {
      const me = await request(rebuilt.app).get('/api/me').set('Cookie', `chronometa.sid=${sid!.value}`);
      expect(me.status).toBe(200);
      expect(me.body.user.login).toBe('reviewer');
    } finally {
      await rebuilt.close();
    }
  });

  it('signs out: the session is gone', async () => {
    const agent = await signIn(t.app, 'coder1');
    expect((await agent.get('/api/me')).status).toBe(200);
    const out = await agent.post('/auth/logout');
    expect(out.status).toBe(204);
    expect((await agent.get('/api/me')).status).toBe(401);
  });

  it('refuses state-changing requests from another origin or without Origin/Referer', async () => {
    const agent = await signIn(t.app, 'admin');
    const cross = await agent.post('/api/tokens').set('Origin', 'https://evil.example').send({ name: 'x' });
    expect(cross.status).toBe(403);
    expect(cross.body.error.message).toMatch(/Cross-site/);
    const cookie = `chronometa.sid=${agent.jar.getCookies({ domain: '127.0.0.1', path: '/', secure: false, script: false })[0].value}`;
    const bare = await request(t.app).post('/api/tokens').set('Cookie', cookie).send({ name: 'x' });
    expect(bare.status).toBe(403);
    const viaReferer = await request(t.app).post('/api/tokens').set('Cookie', cookie).set('Referer', `${origin()}/settings`).send({ name: 'x' });
    expect(viaReferer.status).toBe(201);
  });

  it('rate-limits the sign-in routes', async () => {
    const limited = await createTestApp({ env: { AUTH_RATE_LIMIT_PER_MINUTE: '2' } });
    try {
      const statuses = [];
      for (let i = 0; i < 3; i++) statuses.push((await request(limited.app).get('/auth/github')).status);
      expect(statuses).toEqual([302, 302, 429]);
    } finally {
      await limited.close();
    }
  });

  it('says sign-in is unavailable when the provider does not answer, instead of sending the browser there', async () => {
    const [closed] = await freePorts(1);
    const down = await createTestApp({ env: { GITHUB_AUTHORIZATION_URL: `http://127.0.0.1:${closed}/login/oauth/authorize` } });
    try {
      const res = await request(down.app).get('/auth/github?returnTo=/atlas');
      expect(res.status).toBe(503);
      expect(res.headers.location).toBeUndefined();
      expect(res.headers['set-cookie']).toBeUndefined();
      expect(res.headers['retry-after']).toBe('30');
      expect(res.type).toBe('text/html');
      expect(res.text).toContain('The GitHub sign-in service cannot be reached, so you cannot sign in at the moment. Try again in a minute.');
      expect(res.text).toContain('<a href="/atlas">Back to Chronometa</a>');
    } finally {
      await down.close();
    }
    // the stand-in that answers still gets the redirect
    expect((await request(t.app).get('/auth/github')).status).toBe(302);
  });
});
