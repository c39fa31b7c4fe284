import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import request from 'supertest';
import { pool } from '../../shared/stats/pool.js';
import { createSettledRecord } from '../../server/services/settlement.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };

describe('snapshots', () => {
  let t: TestApp;
  let reviewer: Agent;
  let set: Awaited<ReturnType<typeof settleInventedSet>>;
  let id: string;
  let frozen: any;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    set = await settleInventedSet(t.ctx.db, 'luminance');
    reviewer = await signIn(t.app, 'reviewer');
  });
  afterAll(() => t.close());

  it('a reviewer saves one: 201 with id and a stable URL, readable signed out', async () => {
    const live = await reviewer.post('/api/syntheses').send(body);
    const res = await reviewer.post('/api/snapshots').send(body);
    expect(res.status).toBe(201);
    id = res.body.id;
    expect(res.body.url).toBe(`${process.env.APP_ORIGIN}/snapshots/${id}`);
    const got = await request(t.app).get(`/api/snapshots/${id}`);
    expect(got.status).toBe(200);
    frozen = got.body;
    expect(frozen.rows).toEqual(live.body.rows);
    expect(frozen.result).toEqual(live.body.result);
    expect(frozen.registryVersion).toBe(live.body.registryVersion);
    expect(frozen.request).toMatchObject(body);
    expect(frozen.request.level).toBe(0.95);
    expect(frozen.effects).toHaveLength(13);
    expect(frozen.figures.forest.data.length).toBeGreaterThan(3);
    expect(frozen.createdBy.login).toBe('reviewer');
    const audit = await t.ctx.db('audit_log').where({ action: 'snapshot.created', entity_id: id }).first();
    expect(audit).toBeTruthy();
  });

  it('stays unchanged after a settled effect changes, while a new synthesis moves', async () => {
    const first = set[0];
    const sheet = structuredClone(first.sheet) as any;
    sheet.studies[0].effects[0].reported.mean1 = 900; // a much larger effect
    await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: first.referenceId, sheet, kind: 'edited' }));
    const live = await reviewer.post('/api/syntheses').send(body);
    expect(live.body.result.estimate).not.toBeCloseTo(frozen.result.estimate, 6);
    expect(live.body.registryVersion).toBeGreaterThan(frozen.registryVersion);
    const again = await request(t.app).get(`/api/snapshots/${id}`);
    expect(again.body).toEqual(frozen);
  });

  it('is immutable in the database itself', async () => {
    await expect(t.ctx.db('snapshots').where({ id }).update({ title: 'changed' })).rejects.toThrow(/immutable/);
    await expect(t.ctx.db('snapshots').where({ id }).del()).rejects.toThrow(/immutable/);
  });

  it('exports a CSV whose effect and variance columns re-pool to the snapshot numbers', async () => {
    const res = await request(t.app).get(`/api/snapshots/${id}/export.csv`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/text\/csv/);
    const parsed = Papa.parse<Record<string, string>>(res.text, { header: true, skipEmptyLines: true });
    expect(parsed.meta.fields).toEqual(expect.arrayContaining(['reference', 'study', 'effect', 'variance', 'metric', 'manipulation', 'outcome', 'standard_ms', 'year']));
    expect(parsed.data).toHaveLength(12);
    const again = pool({ effects: parsed.data.map((r) => Number(r.effect)), variances: parsed.data.map((r) => Number(r.variance)), method: 'DL', hksj: false });
    expect(again.estimate).toBeCloseTo(frozen.result.estimate, 12);
    expect(again.ci_lower).toBeCloseTo(frozen.result.ci_lower, 12);
    expect(again.tau2!).toBeCloseTo(frozen.result.tau2, 12);
    expect(again.I2!).toBeCloseTo(frozen.result.I2, 10);
    const effects = await request(t.app).get(`/api/snapshots/${id}/effects.csv`);
    expect(Papa.parse(effects.text, { header: true, skipEmptyLines: true }).data).toHaveLength(13);
  });

  it('exports JSON, BibTeX of the included references and a methods paragraph with PRISMA counts', async () => {
    const json = await request(t.app).get(`/api/snapshots/${id}/export.json`);
    expect(json.headers['content-disposition']).toMatch(/attachment/);
    expect(json.body.result).toEqual(frozen.result);
    const bib = await request(t.app).get(`/api/snapshots/${id}/references.bib`);
    expect(bib.status).toBe(200);
    expect((bib.text.match(/@article\{/g) ?? []).length).toBe(12);
    expect(bib.text).toMatch(/10\.5555\/chronometa\.synth/);
    const methods = await request(t.app).get(`/api/snapshots/${id}/methods.txt`);
    expect(methods.text).toMatch(/DerSimonian–Laird/);
    expect(methods.text).toMatch(/r = 0\.50/);
    // Counted straight from the tables: not yet screened, coded (a sheet past draft), with settled effects.
    const db = t.ctx.db;
    const unscreened = Number((await db('refs').whereNull('merged_into').where({ screening_status: 'unscreened' }).count<{ n: string }[]>({ n: '*' }))[0].n);
    const coded = Number((await db('extractions').whereNot({ state: 'draft' }).countDistinct<{ n: string }[]>({ n: 'reference_id' }))[0].n);
    expect(coded).toBe(12);
    expect(methods.text).toMatch(
      new RegExp(
        `12 records identified in the registry, 0 duplicates removed, 12 records screened on title and abstract, 0 excluded, ${unscreened} not yet screened; ` +
          `12 reports assessed in full text, 0 excluded, 0 awaiting full-text screening; 12 included in the registry, ${coded} coded and 12 with settled effects; of these, 12 references`,
      ),
    );
    expect(frozen.prisma).toMatchObject({ notYetScreened: unscreened, coded, settled: 12, stages: { titleAbstract: { decided: 12, waiting: unscreened }, fullText: { decided: 12, waiting: 0 } } });
    expect(methods.text).toMatch(/Chronometa \d+\.\d+\.\d+ on registry version \d+/);
  });

  it('readers cannot save snapshots; signed-out callers must sign in; 404 for an unknown id', async () => {
    const reader = await signIn(t.app, 'reader');
    const refused = await reader.post('/api/snapshots').send(body);
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('forbidden');
    expect((await anonymous(t.app).post('/api/snapshots').send(body)).status).toBe(401);
    expect((await request(t.app).get('/api/snapshots/0123456789abcdef')).status).toBe(404);
  });

  it('a reviewer token saves one too, titled by its filters unless given a title', async () => {
    const { body: tok } = await reviewer.post('/api/tokens').send({ name: 'snapshots' });
    const res = await request(t.app).post('/api/snapshots').set('Authorization', `Bearer ${tok.token}`).send({ ...body, title: 'Scripted' });
    expect(res.status).toBe(201);
    const all = await request(t.app).post('/api/snapshots').set('Authorization', `Bearer ${tok.token}`).send({ filters: {}, method: 'PM' });
    expect(all.status).toBe(201);
    const got = await request(t.app).get(`/api/snapshots/${all.body.id}`);
    expect(got.body.title).toBe("All settled effects — Hedges' g_s (independent groups), Paule–Mandel");
  });

  it('lists snapshots paged and sorted on the server', async () => {
    const page = await request(t.app).get('/api/snapshots?pageSize=1&sort=title&order=asc');
    expect(page.status).toBe(200);
    expect(page.body.total).toBeGreaterThanOrEqual(2);
    expect(page.body.items).toHaveLength(1);
    expect(page.body.total).toBe(3);
    expect(page.body.items[0].title).toMatch(/^All settled effects/);
    const second = await request(t.app).get('/api/snapshots?pageSize=1&page=2&sort=title&order=asc');
    // default titles name their filters in words ("Luminance, Duration distortion — …"), so it sorts before "Scripted"
    expect(second.body.items[0].title).toMatch(/^Luminance, Duration distortion — /);
    const third = await request(t.app).get('/api/snapshots?pageSize=1&page=3&sort=title&order=asc');
    expect(third.body.items[0].title).toBe('Scripted');
    const mine = await reviewer.get('/api/snapshots?mine=true');
    expect(mine.body.items.every((s: any) => s.createdBy === 'reviewer')).toBe(true);
    expect((await request(t.app).get('/api/snapshots?mine=true')).status).toBe(401);
  });
});
