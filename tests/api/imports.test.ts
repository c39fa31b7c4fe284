import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib, clearSearch, eventually, THREE_GOOD_ONE_BAD } from '../support/references.js';
import { DEMO_IMPORT_LABEL, seed as seedDemoReferences } from '../../seeds/02_demo_references.js';

describe('imports', () => {
  let t: TestApp;
  let coder: Agent;
  beforeAll(async () => {
    t = await createTestApp({ jobs: true, env: { DOI_TIMEOUT_MS: '800' } });
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
  });
  afterAll(async () => {
    await t.close();
  });

  it('imports three good BibTeX entries, rejects the malformed one by name, and creates nothing on a second run', async () => {
    const first = await coder.post('/api/imports').send({ format: 'bibtex', text: THREE_GOOD_ONE_BAD });
    expect(first.status).toBe(201);
    expect(first.body.batch.counts).toEqual({ imported: 3, duplicate: 0, rejected: 1, pending: 0 });
    const statuses = first.body.entries.map((e: { status: string }) => e.status);
    expect(statuses).toEqual(['imported', 'imported', 'rejected', 'imported']);
    const bad = first.body.entries[2];
    expect(bad.index).toBe(3);
    expect(bad.message).toMatch(/^Entry 3 is not closed: a `}` is missing \(key "broken2019", the entry starts on line \d+\)$/);
    expect(first.body.entries[0].referenceId).toEqual(expect.any(Number));
    const refs = await t.ctx.db('refs').orderBy('id').select('doi', 'title', 'year', 'first_author', 'source', 'title_key');
    expect(refs).toHaveLength(3);
    expect(refs[2].doi).toBe('10.5555/test.bib.3');
    expect(refs[0]).toMatchObject({ title: 'Looming discs feel longer', year: 2017, first_author: 'Varga', source: 'bibtex', title_key: 'looming discs feel longer' });

    const again = await coder.post('/api/imports').send({ format: 'bibtex', text: THREE_GOOD_ONE_BAD });
    expect(again.status).toBe(201);
    expect(again.body.batch.counts).toEqual({ imported: 0, duplicate: 3, rejected: 1, pending: 0 });
    expect(again.body.entries[0].referenceId).toBe(first.body.entries[0].referenceId);
    expect(again.body.entries[1].message).toMatch(/neither has a DOI/);
    expect(await t.ctx.db('refs').count({ n: '*' }).first()).toEqual({ n: 3 });

    const report = await coder.get(`/api/imports/${again.body.batch.id}`);
    expect(report.status).toBe(200);
    expect(report.body.batch.counts.duplicate).toBe(3);
    const audit = await t.ctx.db('audit_log').where({ action: 'import.create' }).count({ n: '*' }).first();
    expect(audit?.n).toBe(2);
  });

  it('names the field that is wrong and still imports the good entries beside it', async () => {
    const text = [
      bib('notitle', { author: 'Lee, Kim', year: '2020' }),
      bib('badyear', { title: 'A study with a strange year', author: 'Lee, Kim', year: 'twenty' }),
      bib('baddoi', { title: 'A study with a strange DOI', author: 'Lee, Kim', year: '2020', doi: 'not-a-doi' }),
      bib('fine', { title: 'Perfectly fine oddball timing study', author: 'Lee, Kim', year: '2021', doi: '10.5555/test.fine' }),
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.status).toBe(201);
    const [a, b, c, d] = res.body.entries;
    expect(a.message).toMatch(/key "notitle".*field title is missing/);
    expect(b.message).toMatch(/key "badyear".*field year "twenty" is not a year/);
    expect(c.message).toMatch(/key "baddoi".*field doi "not-a-doi" is not a DOI/);
    expect(d.status).toBe('imported');
  });

  it('imports RIS, keeping DOIs and authors, and rejects a record with no end', async () => {
    const ris = [
      'TY  - JOUR\nTI  - Tactile duration under vibration\nAU  - Serrano, Marta\nAU  - Bo, Lind\nPY  - 2016\nJO  - Invented Haptics\nDO  - 10.5555/test.ris.1\nER  - \n',
      'TY  - JOUR\nTI  - Temporal order after lag adaptation\nAU  - Takahara, Emi\nPY  - 2021\nER  - \n',
      'TY  - JOUR\nTI  - A record cut short\nAU  - Cut, Short\n',
    ].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'ris', text: ris });
    expect(res.status).toBe(201);
    expect(res.body.batch.counts).toEqual({ imported: 2, duplicate: 0, rejected: 1, pending: 0 });
    expect(res.body.entries[2].message).toMatch(/Entry 3.*no "ER {2}-" line/);
    const r = await t.ctx.db('refs').where({ doi: '10.5555/test.ris.1' }).first();
    expect(r).toMatchObject({ first_author: 'Serrano', year: 2016, container: 'Invented Haptics', source: 'ris' });
  });

  it('takes a file upload through multer and refuses files of the wrong type', async () => {
    const file = bib('upload1', { title: 'Uploaded reproduction study', author: 'Up, Lo', year: '2015', doi: '10.5555/test.upload' });
    const res = await coder.post('/api/imports').attach('file', Buffer.from(file), { filename: 'refs.bib', contentType: 'application/x-bibtex' });
    expect(res.status).toBe(201);
    expect(res.body.batch).toMatchObject({ format: 'bibtex', label: 'refs.bib' });
    expect(res.body.batch.counts.imported).toBe(1);
    const wrong = await coder.post('/api/imports').attach('file', Buffer.from([0x89, 0x50, 0x4e, 0x47]), { filename: 'picture.png', contentType: 'image/png' });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error.message).toMatch(/picture\.png.*not a BibTeX/);
  });

  it('resolves DOIs in the background: demo DOIs import, an unknown one and a time-out are rejected with reasons', async () => {
    const text = ['10.5555/chrono.2017.001', 'https://doi.org/10.5555/CHRONO.2018.014', '10.5555/no.such.record', '10.5555/slow.1', 'doi:10.5555/chrono.2017.001', 'nonsense'].join('\n');
    const res = await coder.post('/api/imports').send({ format: 'doi', text });
    expect(res.status).toBe(202);
    expect(res.body.batch.state).toBe('running');
    const id = res.body.batch.id;
    const done = await eventually(async () => {
      const r = await coder.get(`/api/imports/${id}`);
      return r.body.batch.state === 'done' ? r.body : undefined;
    });
    expect(done.batch.counts).toEqual({ imported: 2, duplicate: 1, rejected: 3, pending: 0 });
    const byIndex = Object.fromEntries(done.entries.map((e: { index: number }) => [e.index, e]));
    expect(byIndex[1].status).toBe('imported');
    expect(byIndex[2].status).toBe('imported');
    expect(byIndex[3].message).toMatch(/10\.5555\/no\.such\.record: no such DOI at the resolver \(404\)/);
    expect(byIndex[4].message).toMatch(/did not answer within 0\.8 s/);
    expect(byIndex[5]).toMatchObject({ status: 'duplicate' });
    expect(byIndex[6].message).toMatch(/"nonsense" is not a DOI/);
    const ref = await t.ctx.db('refs').where({ id: byIndex[1].referenceId }).first();
    expect(ref).toMatchObject({ doi: '10.5555/chrono.2017.001', first_author: 'Varga', year: 2017, source: 'doi' });
    // A later batch with a DOI already in the registry reports it as a duplicate of that reference.
    const again = await coder.post('/api/imports').send({ format: 'doi', text: '10.5555/chrono.2017.001' });
    const second = await eventually(async () => {
      const r = await coder.get(`/api/imports/${again.body.batch.id}`);
      return r.body.batch.state === 'done' ? r.body : undefined;
    });
    expect(second.entries[0]).toMatchObject({ status: 'duplicate', referenceId: byIndex[1].referenceId });
  });

  it('answers a large import with its counts and the first page of the entry report; the rest is paged', async () => {
    const text = Array.from({ length: 250 }, (_, i) => bib(`paged${i}`, { title: `Paged report entry ${i} on empty intervals`, author: 'Pager, Ona', year: '2021' })).join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.status).toBe(201);
    expect(res.body.batch.counts).toEqual({ imported: 250, duplicate: 0, rejected: 0, pending: 0 });
    expect(res.body.entriesTotal).toBe(250);
    expect(res.body.entries.map((e: { index: number }) => e.index)).toEqual(Array.from({ length: 100 }, (_, i) => i + 1));
    const last = await coder.get(`/api/imports/${res.body.batch.id}?entryPage=3&entryPageSize=100`);
    expect(last.status).toBe(200);
    expect(last.body.entries.map((e: { index: number }) => e.index)).toEqual(Array.from({ length: 50 }, (_, i) => i + 201));
  });

  it('the demo seed makes one batch with a rejected entry and a likely duplicate, and adds nothing when run again', async () => {
    await seedDemoReferences(t.ctx.db);
    const before = await t.ctx.db('refs').count({ n: '*' }).first();
    await seedDemoReferences(t.ctx.db);
    expect(await t.ctx.db('refs').count({ n: '*' }).first()).toEqual(before);
    const batches = await t.ctx.db('import_batches').where({ label: DEMO_IMPORT_LABEL });
    expect(batches).toHaveLength(1);
    const report = await coder.get(`/api/imports/${batches[0].id}`);
    expect(report.body.batch.counts).toMatchObject({ imported: 8, rejected: 1 });
    expect(report.body.entries.filter((e: { likelyDuplicateOf?: number }) => e.likelyDuplicateOf)).toHaveLength(1);
    const paged = await coder.get(`/api/imports/${batches[0].id}?entryPage=1&entryPageSize=2&entryStatus=imported`);
    expect(paged.body.entries).toHaveLength(2);
    expect(paged.body.entriesTotal).toBe(8);
  });
});
