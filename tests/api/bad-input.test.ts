import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib } from '../support/references.js';
import { pathLikeIn } from '../support/words.js';

const refCount = async (t: TestApp) => Number((await t.ctx.db('refs').count({ n: '*' }).first())?.n);

describe('bad input: ids, numbers, lengths and garbage', () => {
  let t: TestApp;
  let coder: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
  });
  afterAll(() => t.close());

  it('refuses ids PostgreSQL cannot hold with 400, in exports, paths and queries', async () => {
    for (const path of [
      '/api/references/export?format=bibtex&ids=99999999999999999999',
      '/api/references/export?format=csl-json&ids=1,2147483648',
      '/api/references/99999999999999999999',
      '/api/references?batch=99999999999999999999',
      '/api/imports/2147483648',
    ]) {
      const res = await coder.get(path);
      expect(res.status, path).toBe(400);
      expect(res.body.error.code, path).toBe('invalid_input');
      expect(res.body.error.message, path).toMatch(/not an id/);
    }
    const ok = await coder.get('/api/references/export?format=bibtex&ids=2147483647');
    expect(ok.status).toBeLessThan(500);
  });

  it('answers 422 when pooling drives an intermediate result out of floating-point range', async () => {
    for (const body of [
      { effects: [1e308, -1e308], variances: [1, 1] },
      { effects: [0.2, 0.4], variances: [1e-320, 1] },
      { effects: [1e308, -1e308], variances: [1e-320, 1], method: 'REML' },
      { effects: [1e200, 2e200, 3e200], variances: [1, 1, 1], method: 'PM' },
    ]) {
      const res = await request(t.app).post('/api/compute/pool').send(body);
      expect(res.status, JSON.stringify(body)).toBe(422);
      expect(res.body.error.code).toBe('unprocessable');
      expect(res.body.error.message).toMatch(/too extreme to compute with: .* is not a finite number/);
    }
    const fine = await request(t.app).post('/api/compute/pool').send({ effects: [1e150, 2e150], variances: [1, 1] });
    expect(fine.status).toBe(200);
  });

  it('caps field lengths at import as at edit: a 2,700-character title is refused alone, the other 99 import', async () => {
    const entries = Array.from({ length: 100 }, (_, i) =>
      bib(`len${i}`, { title: i === 41 ? `Long ${'t'.repeat(2695)}` : `Interval timing study number ${i}`, author: 'Cap, Len', year: '2019', doi: `10.5555/len.${i}` }),
    );
    const before = await refCount(t);
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text: entries.join('\n') });
    expect(res.status).toBe(201);
    expect(res.body.batch.counts).toEqual({ imported: 99, duplicate: 0, rejected: 1, pending: 0 });
    const bad = res.body.entries.find((e: { status: string }) => e.status === 'rejected');
    expect(bad.index).toBe(42);
    expect(bad.message).toMatch(/Entry 42 \(key "len41"\), line \d+: field title has 2,700 characters; at most 1,000 are allowed/);
    expect(await refCount(t)).toBe(before + 99);

    // the same cap as an edit
    const id = res.body.entries[0].referenceId;
    const edit = await coder.patch(`/api/references/${id}`).send({ version: 1, title: 't'.repeat(1001) });
    expect(edit.status).toBe(400);
    expect(edit.body.error.details[0].path).toBe('body.title');
  });

  it('caps authors, journal and abstract too, naming the field', async () => {
    const text = [
      bib('longauthor', { title: 'Long author name', author: `${'A'.repeat(201)}, Bo`, year: '2019' }),
      bib('longjournal', { title: 'Long journal', author: 'Cap, Len', year: '2019', journal: 'J'.repeat(501) }),
      bib('fine', { title: 'A fine neighbour', author: 'Cap, Len', year: '2019' }),
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.status).toBe(201);
    const [a, b, c] = res.body.entries;
    expect(a.message).toMatch(/key "longauthor".*field author 1 \(family name\) has 201 characters; at most 200/);
    expect(b.message).toMatch(/key "longjournal".*field journal \(container\) has 501 characters; at most 500/);
    expect(c.status).toBe('imported');
  });

  it('says "no entries found" with 422 for garbage, and makes no batch', async () => {
    const batches = async () => Number((await t.ctx.db('import_batches').count({ n: '*' }).first())?.n);
    const before = await batches();
    for (const body of [
      { format: 'bibtex', text: 'this is not bibtex at all, just words; { and } braces' },
      { format: 'bibtex', text: '@comment{only a comment}' },
      { format: 'ris', text: '   \n\n  ' },
      { format: 'doi', text: ' \n , ; \n' },
    ]) {
      const res = await coder.post('/api/imports').send(body);
      expect(res.status, body.text).toBe(422);
      expect(res.body.error.code).toBe('unprocessable');
      expect(res.body.error.message).toMatch(/^no entries found/);
      expect(res.body.error.details).toEqual([{ path: 'body.text', message: 'no entries found' }]);
    }
    const upload = await coder.post('/api/imports').attach('file', Buffer.from('garbage garbage'), 'junk.bib');
    expect(upload.status).toBe(422);
    expect(await batches()).toBe(before);
  });

  it('words every refusal of bad input for people: no schema path, zod wording or API syntax in the message', async () => {
    const reviewer = await signIn(t.app, 'reviewer');
    const level = await reviewer.post('/api/syntheses').send({ level: 2 });
    expect(level.status).toBe(400);
    expect(level.body.error.message).toBe('The confidence level must be between 50% and 99.9%.');
    expect(level.body.error.details).toEqual([{ path: 'body.level', message: 'the confidence level must be between 50% and 99.9%' }]);
    const token = await reviewer.post('/api/tokens').send({ name: '  ' });
    expect(token.status).toBe(400);
    expect(token.body.error.message).toBe('Give the token a name.');
    const refusals = [
      level,
      token,
      await reviewer.post('/api/syntheses').send({ filters: { yearFrom: 'soon' }, dependence: { mode: 'pairs' }, extra: 1 }),
      await reviewer.post('/api/syntheses').send([1, 2]),
      await reviewer.get('/api/references?page=0&pageSize=a'),
      await reviewer.get('/api/snapshots?sort=nothing'),
      await coder.post('/api/imports').send({ format: 'word', text: 5 }),
      await reviewer.post('/api/follows').send({ seShare: -1 }),
    ];
    for (const res of refusals) {
      expect(res.status, JSON.stringify(res.body)).toBe(400);
      const { message, details } = res.body.error as { message: string; details: Array<{ message: string }> };
      expect(pathLikeIn(message), message).toEqual([]);
      for (const d of details) expect(pathLikeIn(d.message), d.message).toEqual([]);
    }
  });
});
