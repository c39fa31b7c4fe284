import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';

describe('personal API tokens', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
  });
  afterAll(() => t.close());

  it('is shown once, stored hashed, acts with the owner roles, and is refused at once when revoked', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const created = await reviewer.post('/api/tokens').send({ name: 'analysis script' });
    expect(created.status).toBe(201);
    const token: string = created.body.token;
    expect(token).toMatch(/^cmt_/);
    const stored = await t.ctx.db('api_tokens').where({ id: created.body.id }).first();
    expect(stored.token_hash).not.toContain(token);
    expect(stored.token_hash).toHaveLength(64);
    const listed = await reviewer.get('/api/tokens');
    expect(listed.body.items[0]).not.toHaveProperty('token');

    const me = await request(t.app).get('/api/me').set('Authorization', `Bearer ${token}`);
    expect(me.status).toBe(200);
    expect(me.body.user.roles).toContain('reviewer');
    // Bearer requests need no Origin (they carry no ambient credentials).
    const viaToken = await request(t.app).post('/api/syntheses').set('Authorization', `Bearer ${token}`).send({});
    expect(viaToken.status).not.toBe(403);
    expect(viaToken.body.error?.code).not.toBe('forbidden');
    // but a token never mints another (tests/api/access-hardening.test.ts)
    expect((await request(t.app).post('/api/tokens').set('Authorization', `Bearer ${token}`).send({ name: 'second' })).status).toBe(403);

    expect((await reviewer.delete(`/api/tokens/${created.body.id}`)).status).toBe(204);
    const after = await request(t.app).get('/api/me').set('Authorization', `Bearer ${token}`);
    expect(after.status).toBe(401);
    expect(after.body.error.message).toMatch(/revoked/);
  });

  it("cannot revoke another user's token", async () => {
    const coder = await signIn(t.app, 'coder1');
    const mine = await coder.post('/api/tokens').send({ name: 'mine' });
    const other = await signIn(t.app, 'coder2');
    const res = await other.delete(`/api/tokens/${mine.body.id}`);
    expect(res.status).toBe(404);
  });
});
