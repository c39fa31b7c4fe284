import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Cite } from '@citation-js/core';
import '@citation-js/plugin-bibtex';
import '@citation-js/plugin-ris';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
const title = 'Luminance and duration distortion, December check';

/** citation-js reads an entry back to CSL-JSON (its own parsers, not ours). */
const readBack = (text: string, type: '@biblatex/text' | '@ris/file') => new Cite(text, { forceType: type }).data as Array<Record<string, any>>;

describe('cite this snapshot', () => {
  let t: TestApp;
  let reviewer: Agent;
  let id: string;
  let saved: { createdAt: string; registryVersion: number };
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    reviewer = await signIn(t.app, 'reviewer');
    const res = await reviewer.post('/api/snapshots').send({ ...body, title });
    expect(res.status).toBe(201);
    id = res.body.id;
    const row = await t.ctx.db('snapshots').where({ id }).first('created_at', 'registry_version');
    saved = { createdAt: new Date(row.created_at).toISOString(), registryVersion: Number(row.registry_version) };
  });
  afterAll(() => t.close());

  it('answers the identifier, URL, registry version and date, signed out, the same as in the snapshot', async () => {
    const res = await request(t.app).get(`/api/snapshots/${id}/citation`);
    expect(res.status).toBe(200);
    const url = `${process.env.APP_ORIGIN}/snapshots/${id}`;
    expect(res.body).toMatchObject({ id, identifier: `chronometa:snapshot:${id}`, url, registryVersion: saved.registryVersion, date: saved.createdAt.slice(0, 10) });
    expect(res.body.text).toContain(title);
    expect(res.body.text).toContain(url);
    expect(res.body.cslJson).toMatchObject({ type: 'dataset', title, URL: url, version: `registry version ${saved.registryVersion}` });
    const view = await request(t.app).get(`/api/snapshots/${id}`);
    expect(view.body.citation).toEqual(res.body);
    const missing = await request(t.app).get('/api/snapshots/0000000000000000/citation');
    expect(missing.status).toBe(404);
  });

  it('its BibTeX and RIS read back with citation-js give the title, URL and date', async () => {
    const { body: c } = await request(t.app).get(`/api/snapshots/${id}/citation`);
    const [y, m, d] = saved.createdAt.slice(0, 10).split('-').map(Number);
    const bib = readBack(c.bibtex, '@biblatex/text');
    expect(bib).toHaveLength(1);
    expect(bib[0].title).toBe(title);
    expect(bib[0].URL).toBe(c.url);
    expect(bib[0].issued['date-parts'][0]).toEqual([y, m, d]);
    expect(bib[0]['citation-key']).toBe(`chronometa_${id}`);
    expect(bib[0].note).toContain(`chronometa:snapshot:${id}`);
    const ris = readBack(c.ris, '@ris/file');
    expect(ris).toHaveLength(1);
    expect(ris[0].title).toBe(title);
    expect(ris[0].URL).toBe(c.url);
    expect(ris[0].issued['date-parts'][0]).toEqual([y, m, d]);
    expect(ris[0].type).toBe('dataset');
    expect(ris[0].version).toBe(`registry version ${saved.registryVersion}`);
  });
});
