import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { createReference } from '../../server/services/references.js';
import { safePdfName } from '../../server/services/attachments.js';

/** Signs in through the provider with `returnTo` on the first leg; answers where the app sends the browser after. */
async function signInReturningTo(app: TestApp['app'], returnTo: string) {
  const agent = request.agent(app);
  const start = await agent.get(`/auth/github?returnTo=${encodeURIComponent(returnTo)}`);
  const authorize = new URL(start.headers.location);
  authorize.searchParams.set('login', 'reader');
  const provider = await fetch(authorize, { redirect: 'manual' });
  const callback = new URL(provider.headers.get('location') ?? '');
  const done = await agent.get(callback.pathname + callback.search);
  expect(done.status).toBe(302);
  return String(done.headers.location);
}

const bytes = (res: request.Request) =>
  res.buffer(true).parse((r, cb) => {
    const chunks: Buffer[] = [];
    r.on('data', (c: Buffer) => chunks.push(c));
    r.on('end', () => cb(null, Buffer.concat(chunks)));
  });

describe('access: redirects, tokens, attachments', () => {
  let t: TestApp;
  let ids: Map<string, number>;
  let coder: Agent;
  let reviewer: Agent;
  let reader: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    reviewer = await signIn(t.app, 'reviewer');
    reader = await signIn(t.app, 'reader');
  });
  afterAll(() => t.close());

  it('sends the browser after sign-in only to a path on this site', async () => {
    for (const hostile of ['/\\evil.example', '//evil.example/x', '/\\/evil.example', 'https://evil.example/', '\\\\evil.example', '/\t/evil.example', 'javascript:alert(1)']) {
      const location = await signInReturningTo(t.app, hostile);
      expect(location, hostile).toBe('/');
      expect(new URL(location, process.env.APP_ORIGIN).origin).toBe(new URL(process.env.APP_ORIGIN!).origin);
    }
    expect(await signInReturningTo(t.app, '/snapshots/abc123?tab=plots#forest')).toBe('/snapshots/abc123?tab=plots#forest');
  });

  it('mints, lists and revokes tokens only from a session, never with a token', async () => {
    const minted = await reviewer.post('/api/tokens').send({ name: 'script' });
    expect(minted.status).toBe(201);
    const bearer = { Authorization: `Bearer ${minted.body.token}` };
    const mint = await request(t.app).post('/api/tokens').set(bearer).send({ name: 'child' });
    expect(mint.status).toBe(403);
    expect(mint.body.error.message).toMatch(/from a signed-in session, not with a token/);
    expect((await request(t.app).get('/api/tokens').set(bearer)).status).toBe(403);
    expect((await request(t.app).delete(`/api/tokens/${minted.body.id}`).set(bearer)).status).toBe(403);
    expect(await t.ctx.db('api_tokens').where({ user_id: ids.get('reviewer') }).count({ n: '*' }).first()).toMatchObject({ n: 1 });
    // the token still works where tokens are meant to
    expect((await request(t.app).get('/api/me').set(bearer)).status).toBe(200);
  });

  it('refuses a revoked token on every router, the compute routes too', async () => {
    const minted = await reviewer.post('/api/tokens').send({ name: 'to revoke' });
    const bearer = { Authorization: `Bearer ${minted.body.token}` };
    const body = { effects: [0.1, 0.3], variances: [0.01, 0.02] };
    expect((await request(t.app).post('/api/compute/pool').set(bearer).send(body)).status).toBe(200);
    expect((await reviewer.delete(`/api/tokens/${minted.body.id}`)).status).toBe(204);
    for (const [method, path] of [['post', '/api/compute/pool'], ['post', '/api/compute/effect'], ['get', '/api/me'], ['post', '/api/syntheses'], ['get', '/api/references']] as const) {
      const res = await request(t.app)[method](path).set(bearer).send(method === 'post' ? body : undefined);
      expect(res.status, path).toBe(401);
      expect(res.body.error.code).toBe('unauthorized');
    }
    const wrong = await request(t.app).post('/api/compute/pool').set({ Authorization: 'Bearer cmt_not-a-token' }).send(body);
    expect(wrong.status).toBe(401);
  });

  it('serves attachments to contributors, curators, reviewers and the uploader only, with a safe *.pdf name', async () => {
    const ref = await t.ctx.db.transaction((trx) => createReference(trx, { title: 'Attachment fixture', author: [{ family: 'Pdf' }], issued: { 'date-parts': [[2020]] } }, { source: 'seed' }));
    const pdf = Buffer.from('%PDF-1.4\n% invented test file\n%%EOF\n');
    const up = await coder.post(`/api/references/${ref.id}/attachments`).attach('file', pdf, { filename: '..\\..\\notes<script>.exe', contentType: 'application/pdf' });
    expect(up.status).toBe(201);
    expect(up.body.filename).toBe('notes_script_.exe.pdf');
    const url = `/api/references/${ref.id}/attachments/${up.body.id}`;

    for (const who of [coder, reviewer, await signIn(t.app, 'curator')]) {
      const got = await bytes(who.get(url));
      expect(got.status).toBe(200);
      expect((got.body as Buffer).equals(pdf)).toBe(true);
      expect(got.headers['content-disposition']).toMatch(/filename="?notes_script_\.exe\.pdf"?/);
    }
    // a reader is refused the same way whether the attachment, or the reference, exists or not
    const existing = await reader.get(url);
    const missing = await reader.get(`/api/references/${ref.id}/attachments/999999`);
    const noRef = await reader.get('/api/references/999999/attachments/1');
    expect([existing.status, missing.status, noRef.status]).toEqual([403, 403, 403]);
    expect(missing.body).toEqual(existing.body);
    expect(noRef.body).toEqual(existing.body);

    // the uploader keeps access after losing the contributor role
    await t.ctx.db('user_roles').where({ user_id: ids.get('coder1'), role: 'contributor' }).delete();
    const own = await bytes(coder.get(url));
    expect(own.status).toBe(200);
    await t.ctx.db('user_roles').insert({ user_id: ids.get('coder1'), role: 'contributor' });

    const notPdf = await coder.post(`/api/references/${ref.id}/attachments`).attach('file', Buffer.from('<html>hi</html>'), { filename: 'x.pdf', contentType: 'application/pdf' });
    expect(notPdf.status).toBe(422);
  });

  it('names stored files safely', () => {
    expect(safePdfName('paper.PDF')).toBe('paper.pdf');
    expect(safePdfName('../../etc/passwd')).toBe('passwd.pdf');
    expect(safePdfName('.hidden')).toBe('hidden.pdf');
    expect(safePdfName('')).toBe('attachment.pdf');
    expect(safePdfName('Résumé 2020 (final).pdf')).toBe('R_sum_ 2020 (final).pdf');
  });

  it('limits signed-out sign-in starts per address (each one makes a session before the provider answers)', async () => {
    const limited = await createTestApp({ env: { AUTH_RATE_LIMIT_PER_MINUTE: '3', TRUST_PROXY: '1' } });
    try {
      const from = (ip: string) => request(limited.app).get('/auth/github').set('X-Forwarded-For', ip);
      for (let i = 0; i < 3; i++) expect((await from('198.51.100.7')).status).toBe(302);
      const refused = await from('198.51.100.7');
      expect(refused.status).toBe(429);
      expect(refused.body.error.code).toBe('rate_limited');
      expect(refused.headers['set-cookie']).toBeUndefined();
      // another address has its own budget
      expect((await from('198.51.100.8')).status).toBe(302);
    } finally {
      await limited.close();
    }
  });
});
