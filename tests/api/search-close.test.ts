import { afterEach, describe, expect, it, vi } from 'vitest';
import { REFERENCES_INDEX } from '../../server/adapters/search.js';
import { rebuildInBackground } from '../../server/services/search.js';
import { bib } from '../support/references.js';
import { createTestApp, resetDb, signIn } from '../support/test-app.js';

// A rebuild still running when an app closes (a clean start fills the index in the background) used to read
// from the closed pool and log "[search] the rebuild failed: Unable to acquire a connection".
describe('closing the app while the search index is rebuilt', () => {
  afterEach(() => vi.restoreAllMocks());

  it('waits for the rebuild to end before it closes the database, so the rebuild completes and stores its build', async () => {
    const setup = await createTestApp();
    await resetDb(setup.ctx.db);
    const coder = await signIn(setup.app, 'coder1');
    const text = Array.from({ length: 30 }, (_, i) => bib(`close${i}`, { title: `Closing while indexing ${i}`, author: 'Lind, Mara', year: '2020' })).join('\n');
    expect((await coder.post('/api/imports').send({ format: 'bibtex', text })).status).toBe(201);
    await setup.close();

    const errors = vi.spyOn(console, 'error');
    const t = await createTestApp();
    const rebuild = rebuildInBackground({ db: t.ctx.db, search: t.ctx.search! });
    await t.close();
    await rebuild;
    expect(errors.mock.calls.map((c) => c.join(' ')).filter((m) => m.includes('[search]'))).toEqual([]);

    const check = await createTestApp();
    try {
      const build = await check.ctx.db('search_index_builds').where({ index_uid: REFERENCES_INDEX }).first('build', 'documents');
      expect(build).toEqual({ build: expect.any(String), documents: 30 });
    } finally {
      await check.close();
    }
  });
});
