import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { createApiToken, userForToken } from '../../server/services/api-tokens.js';

describe('revoking a token revokes the tokens it minted', () => {
  let t: TestApp;
  let reviewer: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    reviewer = await signIn(t.app, 'reviewer');
  });
  afterAll(() => t.close());

  const me = (token: string) => request(t.app).get('/api/me').set('Authorization', `Bearer ${token}`);

  /** Mints a token as the caller the given Bearer token authenticates (the route refuses this: session only). */
  async function mintWith(token: string, name: string) {
    const caller = await userForToken(t.ctx.db, token);
    expect(caller?.via).toBe('token');
    return createApiToken(t.ctx.db, caller!.id, name, caller!.tokenId ?? null);
  }

  async function chain(prefix: string) {
    const a = (await reviewer.post('/api/tokens').send({ name: `${prefix} A` })).body as { id: number; token: string };
    const b = await mintWith(a.token, `${prefix} B`);
    const c = await mintWith(b.token, `${prefix} C`);
    return { a, b, c };
  }

  it('records the minting token: A (session) mints B, B mints C', async () => {
    const { a, b, c } = await chain('record');
    const rows = await t.ctx.db('api_tokens').whereIn('id', [a.id, b.id, c.id]).orderBy('id').select('id', 'minted_by_token_id');
    expect(rows).toEqual([
      { id: a.id, minted_by_token_id: null },
      { id: b.id, minted_by_token_id: a.id },
      { id: c.id, minted_by_token_id: b.id },
    ]);
    // the route itself still refuses a Bearer caller
    expect((await request(t.app).post('/api/tokens').set('Authorization', `Bearer ${a.token}`).send({ name: 'x' })).status).toBe(403);
  });

  it('revoke A → A, B and C answer 401; an unrelated token keeps working', async () => {
    const { a, b, c } = await chain('whole');
    const other = (await reviewer.post('/api/tokens').send({ name: 'unrelated' })).body as { id: number; token: string };
    for (const tok of [a, b, c, other]) expect((await me(tok.token)).status).toBe(200);

    expect((await reviewer.delete(`/api/tokens/${a.id}`)).status).toBe(204);
    for (const tok of [a, b, c]) {
      const res = await me(tok.token);
      expect(res.status).toBe(401);
      expect(res.body.error.message).toMatch(/revoked/);
    }
    expect((await me(other.token)).status).toBe(200);

    const listed = (await reviewer.get('/api/tokens')).body.items as { id: number; revokedAt: string | null }[];
    const revokedAt = (id: number) => listed.find((i) => i.id === id)?.revokedAt;
    for (const id of [a.id, b.id, c.id]) expect(revokedAt(id)).not.toBeNull();
    expect(revokedAt(other.id)).toBeNull();
    const audit = await t.ctx.db('audit_log').where({ action: 'token.revoked', entity_id: String(a.id) }).first('details');
    expect(audit.details).toEqual({ alsoRevoked: [b.id, c.id] });
    // already revoked with A: B is no longer an active token
    expect((await reviewer.delete(`/api/tokens/${b.id}`)).status).toBe(404);
  });

  it('revoke B → B and C answer 401, A (which minted B) keeps working', async () => {
    const { a, b, c } = await chain('middle');
    expect((await reviewer.delete(`/api/tokens/${b.id}`)).status).toBe(204);
    expect((await me(b.token)).status).toBe(401);
    expect((await me(c.token)).status).toBe(401);
    expect((await me(a.token)).status).toBe(200);
  });

  it("another user cannot revoke the chain, and nothing of it is revoked", async () => {
    const { a, b, c } = await chain('foreign');
    const coder = await signIn(t.app, 'coder1');
    expect((await coder.delete(`/api/tokens/${a.id}`)).status).toBe(404);
    for (const tok of [a, b, c]) expect((await me(tok.token)).status).toBe(200);
  });
});
