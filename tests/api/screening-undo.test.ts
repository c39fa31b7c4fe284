import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { screeningUndoResultSchema } from '../../shared/schemas/references.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { bib, clearSearch } from '../support/references.js';

describe('screening: undo of the last decision', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  let curator: Agent;
  const ids: number[] = [];
  const version = async (id: number): Promise<number> => (await coder.get(`/api/references/${id}`)).body.reference.version;
  const decide = async (who: Agent, id: number, body: object) => who.post(`/api/references/${id}/screening`).send({ ...body, version: await version(id) });
  const undo = async (who: Agent, id: number) => who.post(`/api/references/${id}/screening/undo`).send({ version: await version(id) });
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await clearSearch(t);
    coder = await signIn(t.app, 'coder1');
    coder2 = await signIn(t.app, 'coder2');
    curator = await signIn(t.app, 'curator');
    const text = Array.from({ length: 3 }, (_, i) => bib(`u${i}`, { title: `Undo study ${i} on duration judgement`, author: `Undo${i}, B`, year: String(2010 + i), doi: `10.5555/undo.${i}` })).join('\n');
    const res = await coder.post('/api/imports').send({ format: 'bibtex', text });
    ids.push(...res.body.entries.map((e: { referenceId: number }) => e.referenceId));
  });
  afterAll(async () => {
    await t.close();
  });

  it('returns the reference to unscreened, back into the queue, out of the counts and the history, and audits it', async () => {
    expect((await decide(coder, ids[0], { decision: 'excluded', reason: 'wrong_population' })).status).toBe(201);
    expect((await coder.get('/api/screening/counts')).body.excluded.byReason.wrong_population).toBe(1);
    const res = await undo(coder, ids[0]);
    expect(res.status).toBe(200);
    const body = screeningUndoResultSchema.parse(res.body);
    expect(body).toMatchObject({ refId: ids[0], undone: { decision: 'excluded', reason: 'wrong_population' }, screeningStatus: 'unscreened' });
    const detail = await coder.get(`/api/references/${ids[0]}`);
    expect(detail.body.reference.version).toBe(body.version);
    expect(detail.body.screening).toEqual([]);
    const counts = (await coder.get('/api/screening/counts')).body;
    expect(counts.excluded.byReason.wrong_population).toBe(0);
    expect(counts.awaitingScreening).toBe(3);
    expect((await coder.get('/api/screening/queue?limit=5')).body.items.map((i: { id: number }) => i.id)).toContain(ids[0]);
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.undo', entity_id: ids[0] });
    expect(audit).toHaveLength(1);
    const row = await t.ctx.db('screening_decisions').where({ ref_id: ids[0] }).first();
    expect(row.undone_at).not.toBeNull();
  });

  it('goes back one decision at a time: the one before it counts again, then unscreened, then nothing to undo (409)', async () => {
    await decide(coder, ids[1], { decision: 'excluded', reason: 'review_article' });
    await decide(coder, ids[1], { decision: 'included' });
    const first = await undo(coder, ids[1]);
    expect(first.body).toMatchObject({ undone: { decision: 'included' }, screeningStatus: 'excluded' });
    expect((await coder.get(`/api/references/${ids[1]}`)).body.reference.screeningStatus).toBe('excluded');
    expect((await coder.get('/api/screening/counts')).body.excluded.byReason.review_article).toBe(1);
    const second = await undo(coder, ids[1]);
    expect(second.body.screeningStatus).toBe('unscreened');
    const none = await undo(coder, ids[1]);
    expect(none.status).toBe(409);
    expect(none.body.error.message).toMatch(/no decision to undo/);
  });

  it('refuses a stale version (409), another screener (403), and lets a curator undo anyone’s', async () => {
    await decide(coder, ids[2], { decision: 'included' });
    const v = await version(ids[2]);
    const stale = await coder.post(`/api/references/${ids[2]}/screening/undo`).send({ version: v - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.details).toMatchObject({ currentVersion: v, screeningStatus: 'included' });
    const other = await undo(coder2, ids[2]);
    expect(other.status).toBe(403);
    expect(other.body.error.message).toMatch(/coder1/);
    expect((await undo(curator, ids[2])).status).toBe(200);
    const missing = await coder.post('/api/references/999999/screening/undo').send({ version: 1 });
    expect(missing.status).toBe(404);
    const bad = await coder.post(`/api/references/${ids[2]}/screening/undo`).send({});
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('body.version');
  });
});
