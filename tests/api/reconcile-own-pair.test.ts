import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

// A curator who codes a pair does not reconcile it; coding yourself needs another curator to reconcile.
describe('a coder of a pair never reconciles it', () => {
  let t: TestApp;
  let curator: Agent;
  let coder1: Agent;
  let ids: Map<string, number>;

  const codeAndSubmit = async (who: Agent, extractionId: number, mean1: number) => {
    const cur = (await who.get(`/api/extractions/${extractionId}`)).body.extraction;
    const saved = await who.put(`/api/extractions/${extractionId}`).send({ version: cur.version, sheet: luminanceSheet({ mean1 }) });
    expect(saved.status).toBe(200);
    return who.post(`/api/extractions/${extractionId}/submit`).send({ version: saved.body.version });
  };

  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
    curator = await signIn(t.app, 'curator');
    coder1 = await signIn(t.app, 'coder1');
  });
  afterAll(() => t.close());

  it('refuses a curator assigning themselves when no other curator exists, and says so in the coder list', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Solitary', year: 2015 });
    const withAdmin = (await curator.get('/api/assignments/coders')).body;
    expect(withAdmin).toMatchObject({ selfAssignable: true, otherCurators: ['admin'] });
    // an admin holds every role, so the only other curator goes when the admin role does
    await t.ctx.db('user_roles').where({ user_id: ids.get('admin'), role: 'admin' }).del();
    const coders = (await curator.get('/api/assignments/coders')).body;
    expect(coders).toMatchObject({ selfAssignable: false, otherCurators: [] });
    expect(coders.items.find((c: { login: string }) => c.login === 'curator')).toMatchObject({ you: true, curator: true });
    const res = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('curator'), coder2Id: ids.get('coder1') });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/No curator outside this pair could reconcile it/);
    expect(res.body.error.details[0].path).toBe('body.coder1Id');
    await t.ctx.db('user_roles').insert({ user_id: ids.get('admin'), role: 'admin' });
  });

  it('with a second curator, self-assignment works; GET and every reconciliation write answer 403 to the coding curator, 200 to the other', async () => {
    await t.ctx.db('user_roles').insert({ user_id: ids.get('admin'), role: 'curator' });
    const admin = await signIn(t.app, 'admin');
    expect((await curator.get('/api/assignments/coders')).body).toMatchObject({ selfAssignable: true, otherCurators: ['admin'] });
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Twinfold', year: 2016 });
    const made = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('curator'), coder2Id: ids.get('coder1') });
    expect(made.status).toBe(201);
    const [mine, theirs] = made.body.extractionIds as number[];
    const sheets = await t.ctx.db('extractions').whereIn('id', [mine, theirs]).select('id', 'coder_id');
    const curatorSheet = sheets.find((s) => s.coder_id === ids.get('curator'))!.id;
    const coderSheet = sheets.find((s) => s.coder_id === ids.get('coder1'))!.id;
    expect((await codeAndSubmit(curator, curatorSheet, 650)).status).toBe(200);
    const second = await codeAndSubmit(coder1, coderSheet, 720);
    expect(second.body.state).toBe('disputed');
    const id = made.body.id;

    const queue = (await curator.get('/api/reconciliation')).body.items.find((q: { assignmentId: number }) => q.assignmentId === id);
    expect(queue.youCoded).toBe(true);
    expect((await admin.get('/api/reconciliation')).body.items.find((q: { assignmentId: number }) => q.assignmentId === id).youCoded).toBe(false);

    const own = await curator.get(`/api/reconciliation/${id}`);
    expect(own.status).toBe(403);
    expect(own.body.error.message).toMatch(/another curator reconciles it/);
    const pair = await admin.get(`/api/reconciliation/${id}`);
    expect(pair.status).toBe(200);
    const d = pair.body.discrepancies[0];
    const body = { resolution: 'b', rationale: 'Table 2 gives 720 ms.' };
    expect((await curator.put(`/api/reconciliation/${id}/discrepancies/${d.id}`).send(body)).status).toBe(403);
    expect((await curator.post(`/api/reconciliation/${id}/settle`).send({ rationale: 'mine' })).status).toBe(403);
    const oneStep = { version: pair.body.assignment.version, rationale: 'mine', decisions: pair.body.discrepancies.map((x: { id: number }) => ({ discrepancyId: x.id, resolution: 'a' })) };
    expect((await curator.post(`/api/reconciliation/${id}/reconcile`).send(oneStep)).status).toBe(403);
    // the contributor coder is refused too (by role before the pair rule)
    expect((await coder1.get(`/api/reconciliation/${id}`)).status).toBe(403);
    expect((await coder1.post(`/api/reconciliation/${id}/settle`).send({})).status).toBe(403);
    // nothing was written by the refused calls
    expect((await t.ctx.db('discrepancies').where({ assignment_id: id, status: 'resolved' })).length).toBe(0);

    for (const x of pair.body.discrepancies) expect((await admin.put(`/api/reconciliation/${id}/discrepancies/${x.id}`).send(body)).status).toBe(200);
    expect((await admin.post(`/api/reconciliation/${id}/settle`).send({ rationale: '' })).status).toBe(200);
  });

  it('a pair of both curators, with no third, is refused: nobody could reconcile it', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Bothsides', year: 2017 });
    const res = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('curator'), coder2Id: ids.get('admin') });
    expect(res.status).toBe(422);
    await t.ctx.db('user_roles').where({ user_id: ids.get('admin'), role: 'curator' }).delete();
  });
});
