import type { Server } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REFERENCES_INDEX } from '../../server/adapters/search.js';
import { startSearchIndex } from '../../server/fakes/search-index/http.js';
import { freePorts } from '../support/ports.js';
import { bib, eventually } from '../support/references.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';

// A search server of this file's own, restarted (it keeps everything in memory, so it comes back empty).
describe('search after the search server restarts', () => {
  let t: TestApp;
  let coder: Agent;
  let port: number;
  let server: Server;
  const ids: number[] = [];
  const stop = () => new Promise<void>((r) => (server.closeAllConnections(), server.close(() => r())));
  const search = (qs: string) => anonymous(t.app).get(`/api/search?${qs}`);
  const fromIndex = async (qs: string) => {
    const r = await search(qs);
    return r.body.source === 'index' ? r.body : undefined;
  };

  beforeAll(async () => {
    [port] = await freePorts(1);
    server = await startSearchIndex(port);
    t = await createTestApp({ env: { MEILI_HOST: `http://127.0.0.1:${port}` } });
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    const text = [
      bib('r1', { title: 'Looming discs and the stretching of seconds', author: 'Varga, Ilse', year: '2016', doi: '10.5555/rs.1' }),
      bib('r2', { title: 'Flicker rate and interval reproduction', author: 'Okafor, Ada', year: '2019', doi: '10.5555/rs.2' }),
      bib('r3', { title: 'Looming sounds shorten the bisection point', author: 'Haddad, Rami', year: '2021', doi: '10.5555/rs.3' }),
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    ids.push(...res.body.entries.map((e: { referenceId: number }) => e.referenceId));
  });
  afterAll(async () => {
    await stop();
    await t.close();
  });

  it('answers from PostgreSQL until the index holds the build the database expects, then from the index', async () => {
    const first = await search('q=looming');
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ source: 'database', total: 2, facets: { year: { '2016': 1, '2021': 1 }, screening_status: { unscreened: 2 } } });
    expect(first.body.note).toMatch(/being rebuilt/);
    const indexed = await eventually(() => fromIndex('q=looming'));
    expect(indexed.hits.map((h: { id: number }) => h.id).sort()).toEqual([ids[0], ids[2]].sort());
  });

  it('finds the references at once after a restart left the index empty, and re-fills it in the background', async () => {
    await stop();
    server = await startSearchIndex(port);
    const during = await search('q=looming&yearFrom=2020');
    expect(during.status).toBe(200);
    expect(during.body).toMatchObject({ source: 'database', total: 1 });
    expect(during.body.hits[0]).toMatchObject({ id: ids[2], title: 'Looming sounds shorten the bisection point', authors: ['Rami Haddad'], year: 2021, doi: '10.5555/rs.3' });
    const after = await eventually(() => fromIndex('q=looming&yearFrom=2020'));
    expect(after.hits.map((h: { id: number }) => h.id)).toEqual([ids[2]]);
    expect(await t.ctx.search!.count(REFERENCES_INDEX)).toBe(3);
  });

  it('rebuilds an index holding another build (restored from an old copy)', async () => {
    await t.ctx.search!.writeBuild(REFERENCES_INDEX, 'an-older-build');
    expect((await search('q=flicker')).body.source).toBe('database');
    expect((await eventually(() => fromIndex('q=flicker'))).hits.map((h: { id: number }) => h.id)).toEqual([ids[1]]);
  });

  it('answers from PostgreSQL while the search server is away, and a change it missed makes the index stale', async () => {
    await stop();
    const cur = await coder.get(`/api/references/${ids[1]}`);
    const edit = await coder.patch(`/api/references/${ids[1]}`).send({ version: cur.body.reference.version, title: 'Flicker rate and chronostasis' });
    expect(edit.status).toBe(200);
    expect((await t.ctx.db('search_index_builds').where({ index_uid: REFERENCES_INDEX }).first()).build).toBeNull();
    const away = await search('q=chronostasis');
    expect(away.body).toMatchObject({ source: 'database', total: 1 });
    expect(away.body.note).toMatch(/cannot be reached/);
    server = await startSearchIndex(port);
    expect((await search('q=chronostasis')).body.source).toBe('database');
    expect((await eventually(() => fromIndex('q=chronostasis'))).hits.map((h: { id: number }) => h.id)).toEqual([ids[1]]);
  });
});
