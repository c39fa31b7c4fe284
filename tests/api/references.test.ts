import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib, clearSearch } from '../support/references.js';
import { createReference } from '../../server/services/references.js';

describe('references: likely duplicates, merge, edit, export, attachments', () => {
  let t: TestApp;
  let coder: Agent;
  let curator: Agent;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
    curator = await signIn(t.app, 'curator');
  });
  afterAll(async () => {
    await t.close();
  });

  it('createReference computes the indexed columns and is idempotent for exact duplicates', async () => {
    const csl = { type: 'article-journal', title: 'The  Kappa Effect, Revisited!', author: [{ family: 'Ångström', given: 'Lena' }], issued: { 'date-parts': [[2012]] }, 'container-title': 'Invented Letters', DOI: 'HTTPS://doi.org/10.5555/Seed.1' };
    const first = await t.ctx.db.transaction((trx) => createReference(trx, csl, { source: 'seed', createdBy: null }));
    const second = await t.ctx.db.transaction((trx) => createReference(trx, csl, { source: 'seed', createdBy: null }));
    expect(first.created).toBe(true);
    expect(second).toEqual({ id: first.id, created: false });
    const row = await t.ctx.db('refs').where({ id: first.id }).first();
    expect(row).toMatchObject({ doi: '10.5555/seed.1', title: 'The Kappa Effect, Revisited!', year: 2012, first_author: 'Ångström', container: 'Invented Letters', title_key: 'kappa effect revisited', source: 'seed' });
  });

  it('offers a likely duplicate to curators, and the merge keeps the richer record, moves screening decisions and is audited', async () => {
    const a = await coder.post('/api/imports').send({
      format: 'bibtex',
      text: bib('rich', { title: 'Looming and the stretching of time', author: 'Varga, Ilse and Noor, Tamsin', year: '2017', journal: 'Journal of Invented Psychophysics', volume: '12', pages: '1--9', doi: '10.5555/merge.rich', abstract: 'Looming discs lasted longer.' }),
    });
    const richId = a.body.entries[0].referenceId;
    const b = await coder.post('/api/imports').send({ format: 'bibtex', text: bib('poor', { title: 'Looming and the Stretching of Time.', author: 'Varga, I.', year: '2017' }) });
    expect(b.body.entries[0].status).toBe('imported');
    expect(b.body.entries[0].likelyDuplicateOf).toBe(richId);
    expect(b.body.entries[0].message).toMatch(/looks like reference #\d+/);
    const poorId = b.body.entries[0].referenceId;

    // A decision on the poorer record must follow it into the survivor.
    const dec = await coder.post(`/api/references/${poorId}/screening`).send({ decision: 'excluded', version: 1, reason: 'review_article' });
    expect(dec.status).toBe(201);

    const list = await curator.get('/api/duplicates');
    expect(list.status).toBe(200);
    expect(list.body.total).toBe(1);
    const cand = list.body.items[0];
    expect([cand.a.id, cand.b.id].sort()).toEqual([richId, poorId].sort());

    const denied = await coder.post(`/api/duplicates/${cand.id}/merge`).send({});
    expect(denied.status).toBe(403);

    const merged = await curator.post(`/api/duplicates/${cand.id}/merge`).send({});
    expect(merged.status).toBe(200);
    expect(merged.body).toMatchObject({ kept: richId, merged: poorId });
    expect(merged.body.moved['screening_decisions.ref_id']).toBe(1);

    const survivor = await coder.get(`/api/references/${richId}`);
    expect(survivor.body.reference.screeningStatus).toBe('excluded');
    expect(survivor.body.screening).toHaveLength(1);
    expect(survivor.body.screening[0].reason).toBe('review_article');
    const gone = await coder.get(`/api/references/${poorId}`);
    expect(gone.body.reference.mergedInto).toBe(richId);
    const listed = await coder.get('/api/references?pageSize=200');
    expect(listed.body.items.map((r: { id: number }) => r.id)).not.toContain(poorId);
    const audit = await t.ctx.db('audit_log').where({ action: 'reference.merge' }).first();
    expect(audit.details).toMatchObject({ kept: richId, merged: poorId, candidate: cand.id });
    expect(audit.entity_id).toBe(String(richId));
    const after = await curator.get('/api/duplicates?status=merged');
    expect(after.body.items[0]).toMatchObject({ id: cand.id, status: 'merged', keptRef: richId });
    // Screening a merged record is refused with a pointer to the survivor.
    const late = await coder.post(`/api/references/${poorId}/screening`).send({ decision: 'included', version: 1 });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(new RegExp(`merged into reference ${richId}`));
  });

  it('moves rows of tables added later (found through the catalog), not a fixed list', async () => {
    await t.ctx.db.raw('CREATE TABLE IF NOT EXISTS tmp_later_feature (id serial primary key, about integer REFERENCES refs(id))');
    try {
      const x = await t.ctx.db.transaction((trx) => createReference(trx, { title: 'Catalog test one', author: [{ family: 'Cat' }], issued: { 'date-parts': [[2001]] }, DOI: '10.5555/cat.1' }, { source: 'seed' }));
      const y = await t.ctx.db.transaction((trx) => createReference(trx, { title: 'Catalog test one', author: [{ family: 'Cat' }], issued: { 'date-parts': [[2001]] } }, { source: 'seed' }));
      expect(y.likelyDuplicateOf).toBe(x.id);
      await t.ctx.db('tmp_later_feature').insert([{ about: y.id }, { about: y.id }]);
      const res = await curator.post('/api/references/merge').send({ a: x.id, b: y.id, keep: x.id });
      expect(res.status).toBe(200);
      expect(res.body.moved['tmp_later_feature.about']).toBe(2);
      expect(await t.ctx.db('tmp_later_feature').where({ about: x.id }).count({ n: '*' }).first()).toEqual({ n: 2 });
    } finally {
      await t.ctx.db.raw('DROP TABLE tmp_later_feature');
    }
  });

  it('edits with a version check, says which field is wrong, and refuses a DOI another reference has', async () => {
    const r = await coder.post('/api/imports').send({ format: 'bibtex', text: bib('edit1', { title: 'Before the edit', author: 'Edit, Ed', year: '2010' }) });
    const id = r.body.entries[0].referenceId;
    const cur = await coder.get(`/api/references/${id}`);
    const ok = await coder.patch(`/api/references/${id}`).send({ version: cur.body.reference.version, title: 'After the edit', year: 2011 });
    expect(ok.status).toBe(200);
    expect(ok.body.changed.sort()).toEqual(['issued', 'title']);
    const stale = await coder.patch(`/api/references/${id}`).send({ version: cur.body.reference.version, title: 'Stale' });
    expect(stale.status).toBe(409);
    const bad = await coder.patch(`/api/references/${id}`).send({ version: ok.body.version, year: 99, doi: 'nope' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['body.doi', 'body.year']);
    const taken = await coder.patch(`/api/references/${id}`).send({ version: ok.body.version, doi: '10.5555/merge.rich' });
    expect(taken.status).toBe(409);
    const row = await t.ctx.db('refs').where({ id }).first();
    expect(row).toMatchObject({ title: 'After the edit', year: 2011, title_key: 'after the edit', version: ok.body.version });
  });

  it('exports a selection as BibTeX and CSL-JSON', async () => {
    const ids = (await t.ctx.db('refs').whereNull('merged_into').orderBy('id').limit(2).pluck('id')) as number[];
    const bibtex = await coder.get(`/api/references/export?format=bibtex&ids=${ids.join(',')}`);
    expect(bibtex.status).toBe(200);
    expect(bibtex.headers['content-type']).toMatch(/x-bibtex/);
    expect((bibtex.text.match(/^@\w+\{/gm) ?? []).length).toBe(2);
    const json = await coder.get(`/api/references/export?format=csl-json&ids=${ids.join(',')}`);
    const records = JSON.parse(json.text);
    expect(records.map((r: { id: string }) => r.id)).toEqual(ids.map((i) => `ref-${i}`));
    const missing = await coder.get('/api/references/export?format=bibtex&ids=999999');
    expect(missing.status).toBe(404);
  });

  it('stores a PDF attachment, serves it only to signed-in people, and refuses what is not a PDF', async () => {
    const id = (await t.ctx.db('refs').whereNull('merged_into').first('id')).id;
    const pdf = Buffer.from('%PDF-1.4\n% invented test file\n%%EOF\n');
    const up = await coder.post(`/api/references/${id}/attachments`).attach('file', pdf, { filename: 'paper.pdf', contentType: 'application/pdf' });
    expect(up.status).toBe(201);
    const fake = await coder.post(`/api/references/${id}/attachments`).attach('file', Buffer.from('not really'), { filename: 'x.pdf', contentType: 'application/pdf' });
    expect(fake.status).toBe(422);
    const got = await coder.get(`/api/references/${id}/attachments/${up.body.id}`).buffer(true).parse((res, cb) => {
      const chunks: Buffer[] = [];
      res.on('data', (c: Buffer) => chunks.push(c));
      res.on('end', () => cb(null, Buffer.concat(chunks)));
    });
    expect(got.status).toBe(200);
    expect((got.body as Buffer).equals(pdf)).toBe(true);
    const { anonymous } = await import('../support/test-app.js');
    const anon = await anonymous(t.app).get(`/api/references/${id}/attachments/${up.body.id}`);
    expect(anon.status).toBe(401);
    const page = await coder.get(`/api/references/${id}`);
    expect(page.body.attachments[0]).toMatchObject({ filename: 'paper.pdf', sizeBytes: pdf.length });
  });
});
