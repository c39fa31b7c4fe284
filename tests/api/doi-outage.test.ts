import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startDoiResolver } from '../../server/fakes/doi-resolver.js';
import { DOI_RETRY, resolveDoiEntries } from '../../server/services/imports.js';
import { freePorts } from '../support/ports.js';
import { clearSearch, eventually } from '../support/references.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';

// The app's DOI resolver is a stand-in of this file on a port of its own, started only after the import: until
// then every look-up is refused, as in an outage of doi.org.
describe('DOI look-ups during a resolver outage', () => {
  let t: TestApp;
  let coder: Agent;
  let port: number;
  let resolver: Server | undefined;
  beforeAll(async () => {
    [port] = await freePorts(1);
    t = await createTestApp({ jobs: true, env: { DOI_RESOLVER_URL: `http://127.0.0.1:${port}`, DOI_TIMEOUT_MS: '2000' } });
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
  });
  afterAll(async () => {
    resolver?.closeAllConnections();
    await new Promise((r) => (resolver ? resolver.close(r) : r(undefined)));
    await t.close();
  });

  it('keeps refused look-ups pending with "resolver unreachable, will retry" and imports them once the resolver is back', async () => {
    const res = await coder.post('/api/imports').send({ format: 'doi', text: '10.5555/chrono.2017.001\n10.5555/chrono.2018.014\n10.5555/no.such.record' });
    expect(res.status).toBe(202);
    const id = res.body.batch.id;
    const waiting = await eventually(async () => {
      const r = await coder.get(`/api/imports/${id}`);
      return r.body.entries.every((e: { message?: string }) => e.message) ? r.body : undefined;
    });
    expect(waiting.batch.state).toBe('running');
    expect(waiting.batch.counts).toEqual({ imported: 0, duplicate: 0, rejected: 0, pending: 3 });
    expect(waiting.resolverUnreachable).toBe(3);
    for (const e of waiting.entries) expect(e.message).toMatch(/resolver unreachable, will retry \(the DOI resolver could not be reached/);

    resolver = await startDoiResolver(port);
    const done = await eventually(async () => {
      const r = await coder.get(`/api/imports/${id}`);
      return r.body.batch.state === 'done' ? r.body : undefined;
    }, 25_000);
    expect(done.batch.counts).toEqual({ imported: 2, duplicate: 0, rejected: 1, pending: 0 });
    expect(done.resolverUnreachable).toBe(0);
    expect(done.entries[2].message).toMatch(/no such DOI at the resolver \(404\)/);
    expect(await t.ctx.db('refs').where({ doi: '10.5555/chrono.2018.014', source: 'doi' }).first()).toBeTruthy();
  }, 40_000);

  it('retries over at least an hour and rejects on the last attempt what the resolver never answered', async () => {
    const span = DOI_RETRY.retryDelay * (2 ** DOI_RETRY.retryLimit - 1);
    expect(span).toBeGreaterThanOrEqual(3600);
    const down = await createTestApp({ env: { DOI_RESOLVER_URL: 'http://127.0.0.1:1', JOBS_ENABLED: 'false' } });
    try {
      const [batch] = await t.ctx.db('import_batches').insert({ format: 'doi', total: 1, created_by: null }).returning('id');
      await t.ctx.db('import_entries').insert({ batch_id: batch.id, idx: 1, status: 'pending', entry_key: '10.5555/chrono.2019.007' });
      expect(await resolveDoiEntries(down.ctx, { batchId: batch.id, entries: [1] }, { final: false })).toBe(1);
      expect(await t.ctx.db('import_entries').where({ batch_id: batch.id }).first()).toMatchObject({ status: 'pending' });
      expect(await resolveDoiEntries(down.ctx, { batchId: batch.id, entries: [1] }, { final: true })).toBe(0);
      const entry = await t.ctx.db('import_entries').where({ batch_id: batch.id }).first();
      expect(entry.status).toBe('rejected');
      expect(entry.message).toMatch(/could not be reached .*\(the last of the retries\)/);
      expect((await t.ctx.db('import_batches').where({ id: batch.id }).first()).state).toBe('done');
    } finally {
      await down.close();
    }
  });
});
