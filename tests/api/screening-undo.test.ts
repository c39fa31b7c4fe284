import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { screeningUndoResultSchema } from '../../shared/schemas/references.js';
import { type Agent, type TestApp } from '../support/test-app.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';
import { settleInventedReference } from './syntheses-fixtures.js';

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
    ({ t, coder, coder2, curator } = await screeningTeam());
    const text = Array.from({ length: 3 }, (_, i) => bib(`u${i}`, { title: `Undo study ${i} on duration judgement`, author: `Undo${i}, B`, year: String(2010 + i), doi: `10.5555/undo.${i}` })).join('\n');
    ids.push(...(await importBibtex(coder, text)));
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
    expect(stale.body.error.details).toMatchObject({ currentVersion: v, screeningStatus: 'awaiting_full_text' });
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

  it('undoing a curator’s exclusion settles exactly the records it withdrew again: back in a synthesis, one registry change, audited', async () => {
    const s = await settleInventedReference(t.ctx.db, 'luminance', 2015, [{ mean1: 660, mean2: 600, sd: 80, n: 16, second: { mean1: 650, mean2: 605 } }]);
    const id = s.referenceId;
    const synthesis = async () => (await coder.post('/api/syntheses').send({ filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } })).body;
    const before = await synthesis();
    expect(before.counts).toEqual({ effects: 2, studies: 1, references: 1 });
    expect((await decide(coder, id, { decision: 'included' })).status).toBe(201);
    const excluded = await decide(curator, id, { decision: 'excluded', reason: 'review_article' });
    expect(excluded.body.withdrawnRecords).toEqual([s.recordId]);
    // Nothing left to pool, and the effects list is empty.
    expect((await coder.get(`/api/effects?referenceId=${id}`)).body.total).toBe(0);

    // A contributor may not undo a curator's exclusion.
    expect((await undo(coder, id)).status).toBe(403);
    const changes = async () => Number((await t.ctx.db('registry_changes').count({ n: '*' }).first())!.n);
    const changesBefore = await changes();
    const res = await undo(curator, id);
    expect(res.status).toBe(200);
    const body = screeningUndoResultSchema.parse(res.body);
    expect(body).toMatchObject({ undone: { decision: 'excluded' }, screeningStatus: 'included', restoredRecords: [s.recordId] });
    expect(await changes()).toBe(changesBefore + 1);
    expect(body.registryVersion).toBeGreaterThan(excluded.body.registryVersion);
    const after = await synthesis();
    expect(after.counts).toEqual({ effects: 2, studies: 1, references: 1 });
    expect(after.registryVersion).toBe(body.registryVersion);
    expect(after.result.estimate).toBeCloseTo(before.result.estimate, 12);
    expect((await t.ctx.db('extractions').where({ id: s.recordId }).first()).state).toBe('settled');
    const settlement = await t.ctx.db('settlements').where({ record_id: s.recordId }).orderBy('id', 'desc').first();
    expect(settlement).toMatchObject({ kind: 'restored', rationale: expect.stringMatching(/Exclusion undone at screening/) });
    expect(await t.ctx.db('audit_log').where({ action: 'record.restore', entity_id: String(s.recordId) })).toHaveLength(1);
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.undo', entity_id: String(id) }).first();
    expect(audit.details).toMatchObject({ decision: 'excluded', restoredRecords: [s.recordId] });
  });

  it('refuses (409, in words) to restore when the reference was settled again since the exclusion, and changes nothing', async () => {
    const s = await settleInventedReference(t.ctx.db, 'luminance', 2016, [{ mean1: 640, mean2: 600, sd: 80, n: 20 }]);
    const id = s.referenceId;
    const excluded = await decide(curator, id, { decision: 'excluded', reason: 'review_article' });
    expect(excluded.body.withdrawnRecords).toEqual([s.recordId]);
    // Another settled record of the same reference appears (as a later coding would make).
    const [other] = await t.ctx.db('extractions').insert({ reference_id: id, kind: 'settled', state: 'settled', record_version: 1, updated_by: null }).returning('id');
    const v = await version(id);
    const res = await undo(curator, id);
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(new RegExp(`settled again since the exclusion \\(record ${other.id}\\).*cannot be undone`));
    expect((await coder.get(`/api/references/${id}`)).body.reference).toMatchObject({ version: v, screeningStatus: 'excluded' });
    expect((await t.ctx.db('extractions').where({ id: s.recordId }).first()).state).toBe('withdrawn');
    expect(await t.ctx.db('screening_decisions').where({ ref_id: id }).whereNotNull('undone_at')).toHaveLength(0);
  });
});
