import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib, clearSearch } from '../support/references.js';
import { rebuildReferenceIndex } from '../../server/services/search.js';

describe('search', () => {
  let t: TestApp;
  let coder: Agent;
  let curator: Agent;
  const id: Record<string, number> = {};
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
    curator = await signIn(t.app, 'curator');
    const text = [
      bib('a', { title: 'Looming discs stretch perceived duration', author: 'Varga, Ilse and Noor, Tamsin', year: '2015', doi: '10.5555/s.a' }),
      bib('b', { title: 'Auditory flutter and duration judgements', author: 'Okafor, Ada', year: '2018', doi: '10.5555/s.b' }),
      bib('c', { title: 'Numerosity and the reproduction of intervals', author: 'Mbeki, Lerato', year: '2021', doi: '10.5555/s.c' }),
      bib('d', { title: 'Looming sounds in the bisection task', author: 'Haddad, Rami', year: '2022' }),
      bib('e', { title: 'Looming sounds in the bisection task', author: 'Haddad, Rami', year: '2022', doi: '10.5555/s.e' }),
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    ['a', 'b', 'c', 'd', 'e'].forEach((k, i) => (id[k] = res.body.entries[i].referenceId));
  });
  afterAll(async () => {
    await t.close();
  });

  const search = (qs: string) => anonymous(t.app).get(`/api/search?${qs}`);

  it('finds by a title word and by author, in the contract shape', async () => {
    const byWord = await search('q=numerosity');
    expect(byWord.status).toBe(200);
    expect(byWord.body.total).toBe(1);
    expect(byWord.body.hits[0]).toMatchObject({ id: id.c, title: 'Numerosity and the reproduction of intervals', year: 2021, authors: ['Lerato Mbeki'], doi: '10.5555/s.c' });
    const byAuthor = await search('q=okafor');
    expect(byAuthor.body.hits.map((h: { id: number }) => h.id)).toEqual([id.b]);
    const prefix = await search('q=loom');
    expect(prefix.body.total).toBe(3);
  });

  it('honours year and status filters and reports facet counts', async () => {
    const years = await search('q=looming&yearFrom=2016&yearTo=2022');
    expect(years.body.hits.map((h: { id: number }) => h.id).sort()).toEqual([id.d, id.e].sort());
    expect(years.body.facets.year).toEqual({ '2022': 2 });
    await coder.post(`/api/references/${id.a}/screening`).send({ decision: 'included', version: 1 });
    const incl = await search('q=&status=awaiting_full_text');
    expect(incl.body.hits.map((h: { id: number }) => h.id)).toEqual([id.a]);
    const all = await search('q=');
    expect(all.body.total).toBe(5);
    expect(all.body.facets.screening_status).toEqual({ awaiting_full_text: 1, unscreened: 4 });
    const bad = await search('yearFrom=abc');
    expect(bad.status).toBe(400);
  });

  it('reflects an edit and a merge', async () => {
    const cur = await coder.get(`/api/references/${id.b}`);
    await coder.patch(`/api/references/${id.b}`).send({ version: cur.body.reference.version, title: 'Auditory flutter and chronostasis' });
    expect((await search('q=chronostasis')).body.hits.map((h: { id: number }) => h.id)).toEqual([id.b]);
    expect((await search('q=judgements')).body.total).toBe(0);
    const dup = await curator.get('/api/duplicates');
    const cand = dup.body.items.find((c: { a: { id: number }; b: { id: number } }) => [c.a.id, c.b.id].includes(id.d));
    expect(cand).toBeTruthy();
    const merged = await curator.post(`/api/duplicates/${cand.id}/merge`).send({});
    expect(merged.body.kept).toBe(id.e);
    const after = await search('q=bisection');
    expect(after.body.hits.map((h: { id: number }) => h.id)).toEqual([id.e]);
  });

  it('a rebuild from PostgreSQL gives the same answers', async () => {
    const n = await rebuildReferenceIndex(t.ctx.db, t.ctx.search!);
    expect(n).toBe(4);
    expect((await search('q=looming')).body.total).toBe(2);
  });

  it('answers 503 with a clear message when no search server is configured', async () => {
    const bare = await createTestApp({ env: { MEILI_HOST: undefined as unknown as string } });
    try {
      const res = await anonymous(bare.app).get('/api/search?q=looming');
      expect(res.status).toBe(503);
      expect(res.body.error.message).toMatch(/Search is not configured/);
    } finally {
      await bare.close();
    }
  });
});
