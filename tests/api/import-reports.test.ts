import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib } from '../support/references.js';

describe('import reports: duplicates by DOI, a batch holds what it created, parser errors in words', () => {
  let t: TestApp;
  let coder: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
  });
  afterAll(() => t.close());

  it('a DOI already in the registry is a duplicate of that reference, not rejected (even one the resolver does not know)', async () => {
    const first = await coder.post('/api/imports').send({ format: 'bibtex', text: bib('known', { title: 'Known to the registry only', author: 'Reg, Ina', year: '2020', doi: '10.5555/registry-only.1' }) });
    const id = first.body.entries[0].referenceId;
    expect(id).toEqual(expect.any(Number));
    const list = await coder.post('/api/imports').send({ format: 'doi', text: 'https://doi.org/10.5555/REGISTRY-ONLY.1' });
    expect(list.status).toBe(201);
    expect(list.body.batch.state).toBe('done');
    expect(list.body.entries).toEqual([expect.objectContaining({ status: 'duplicate', referenceId: id, message: `Line 1: 10.5555/registry-only.1 is already reference #${id}` })]);
  });

  it("a batch's screening queue and /references?batch= hold only the references that batch created", async () => {
    const text = [
      bib('again', { title: 'Known to the registry only', author: 'Reg, Ina', year: '2020', doi: '10.5555/registry-only.1' }),
      bib('fresh', { title: 'A reference this batch creates', author: 'New, Nia', year: '2021', doi: '10.5555/batch-made.1' }),
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.body.batch.counts).toMatchObject({ imported: 1, duplicate: 1 });
    const batch = res.body.batch.id;
    const made = res.body.entries[1].referenceId;
    const refs = await coder.get(`/api/references?batch=${batch}`);
    expect(refs.body.total).toBe(1);
    expect(refs.body.items.map((r: { id: number }) => r.id)).toEqual([made]);
    const queue = await coder.get(`/api/screening/queue?batch=${batch}`);
    expect(queue.body.items.map((r: { id: number }) => r.id)).toEqual([made]);
    expect(queue.body.remaining).toBe(1);
  });

  it('says what is wrong with a BibTeX entry in words, on the line of the file', async () => {
    const text = [
      '@article{a1, title={Fine one}, author={Ann, B}, year={2020}}',
      '@article{a2, title={No close, author={Ann, B}, year={2020}',
      '@article{a3, title={Missing comma} author={Ann, B}, year={2020}}',
      '@article{a4, title {No equals}, year={2020}}',
      '@article{a5, title="Unclosed quote, year={2020}}',
      '@article{a6,\n title={Fine two},\n year={2020}\n author {x}}',
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.status).toBe(201);
    expect(res.body.entries.map((e: { message?: string }) => e.message ?? 'ok')).toEqual([
      'ok',
      'Entry 2 is not closed: a `}` is missing (key "a2", the entry starts on line 2)',
      'Entry 3 is not well formed: a comma is missing between two fields (key "a3", line 3, column 36)',
      'Entry 4 is not well formed: a `=` is missing (found a `{` instead) (key "a4", line 4, column 20)',
      'Entry 5 is not closed: a `"` is missing (key "a5", the entry starts on line 5)',
      'Entry 6 is not well formed: a comma is missing between two fields (key "a6", line 9, column 2)',
    ]);
  });
});
