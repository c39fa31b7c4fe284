import { describe, expect, it, vi } from 'vitest';
import { sessionPruneSeconds } from '../../server/context.js';
import { createTestApp, resetDb, signIn } from '../support/test-app.js';

describe('expired sessions are pruned', () => {
  it('deletes expired session rows on the prune interval and keeps the live ones', async () => {
    const t = await createTestApp({ env: { SESSION_PRUNE_SECONDS: '1' } });
    try {
      await resetDb(t.ctx.db);
      await t.ctx.db('session').insert({ sid: 'expired-one', sess: JSON.stringify({ cookie: {} }), expire: new Date(Date.now() - 60_000) });
      const agent = await signIn(t.app, 'coder1'); // the store's first write starts its prune timer
      const end = Date.now() + 10_000;
      while ((await t.ctx.db('session').where({ sid: 'expired-one' }).first()) && Date.now() < end) await new Promise((r) => setTimeout(r, 200));
      expect(await t.ctx.db('session').where({ sid: 'expired-one' }).first()).toBeUndefined();
      expect((await agent.get('/api/me')).status).toBe(200);
    } finally {
      await t.close();
    }
  });

  it('stops pruning when the app closes, so no prune runs on the closed pool', async () => {
    const t = await createTestApp({ env: { SESSION_PRUNE_SECONDS: '1' } });
    await signIn(t.app, 'coder1'); // starts the prune timer
    const errors = vi.spyOn(console, 'error');
    try {
      await t.close();
      await new Promise((r) => setTimeout(r, 2_500)); // more than two prune intervals
      expect(errors.mock.calls.map((c) => c.map(String).join(' ')).filter((line) => /prune/i.test(line))).toEqual([]);
    } finally {
      errors.mockRestore();
    }
  });

  it('prunes every 15 minutes unless told otherwise, and never under test unless asked', () => {
    expect(sessionPruneSeconds({ NODE_ENV: 'production', SESSION_PRUNE_SECONDS: undefined })).toBe(900);
    expect(sessionPruneSeconds({ NODE_ENV: 'development', SESSION_PRUNE_SECONDS: undefined })).toBe(900);
    expect(sessionPruneSeconds({ NODE_ENV: 'test', SESSION_PRUNE_SECONDS: undefined })).toBe(false);
    expect(sessionPruneSeconds({ NODE_ENV: 'production', SESSION_PRUNE_SECONDS: 0 })).toBe(false);
  });
});
