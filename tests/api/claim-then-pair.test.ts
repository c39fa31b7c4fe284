import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Agent, TestApp } from '../support/test-app.js';
import { codingTeam } from '../support/coding-team.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

// Claim, then pair: a curator's assignment adopts the claims coders already made, so no work is set aside.
describe('claim, then pair', () => {
  let t: TestApp;
  let curator: Agent;
  let coder1: Agent;
  let coder2: Agent;
  let ids: Map<string, number>;

  const claim = async (who: Agent, referenceId: number) => {
    const res = await who.post('/api/extractions').send({ referenceId });
    expect(res.status).toBe(201);
    return res.body.id as number;
  };
  const fill = async (who: Agent, id: number, sheet = luminanceSheet()) => {
    const cur = (await who.get(`/api/extractions/${id}`)).body.extraction;
    const saved = await who.put(`/api/extractions/${id}`).send({ version: cur.version, sheet });
    expect(saved.status).toBe(200);
    return saved.body.version as number;
  };
  const submit = async (who: Agent, id: number, version: number) => {
    const res = await who.post(`/api/extractions/${id}/submit`).send({ version });
    expect(res.status).toBe(200);
    return res.body;
  };
  const assign = (referenceId: number, c1 = 'coder1', c2 = 'coder2') => curator.post('/api/assignments').send({ referenceId, coder1Id: ids.get(c1), coder2Id: ids.get(c2) });

  beforeAll(async () => {
    ({ t, ids, curator, coder1, coder2 } = await codingTeam());
  });
  afterAll(() => t.close());

  it('two submitted claims are compared as soon as a curator pairs them (matched → settled)', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Brightwater', year: 2016 });
    const x1 = await claim(coder1, ref);
    const x2 = await claim(coder2, ref);
    await submit(coder1, x1, await fill(coder1, x1));
    await submit(coder2, x2, await fill(coder2, x2));
    const mails0 = Number((await t.ctx.db('mail_log').where({ kind: 'assignment' }).count({ n: '*' }))[0].n);

    const res = await assign(ref);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ state: 'settled', discrepancies: 0 });
    expect(res.body.extractionIds.sort()).toEqual([x1, x2].sort());
    expect(res.body.adopted.map((c: { state: string }) => c.state)).toEqual(['submitted', 'submitted']);
    // no blank drafts were made; both finished sheets are the pair's
    const sheets = await t.ctx.db('extractions').where({ reference_id: ref, kind: 'coding' }).select('id', 'assignment_id', 'state');
    expect(sheets).toHaveLength(2);
    expect(new Set(sheets.map((s) => s.assignment_id))).toEqual(new Set([res.body.id]));
    expect(sheets.every((s) => s.state === 'settled')).toBe(true);
    const record = await t.ctx.db('extractions').where({ reference_id: ref, kind: 'settled', state: 'settled' }).first();
    expect(record).toBeTruthy();
    // one mail per coder, telling them their submitted sheet joined the pair
    const mails = await t.ctx.db('mail_log').where({ kind: 'assignment' }).orderBy('id').offset(mails0);
    expect(mails).toHaveLength(2);
    expect(mails[0].body).toMatch(/submitted sheet joins the pair/);
  });

  it('submitted claims that disagree go straight to the reconciliation queue', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Lowmeadow', year: 2017 });
    const x1 = await claim(coder1, ref);
    const x2 = await claim(coder2, ref);
    await submit(coder1, x1, await fill(coder1, x1, luminanceSheet({ mean1: 650 })));
    await submit(coder2, x2, await fill(coder2, x2, luminanceSheet({ mean1: 700 })));
    const res = await assign(ref);
    expect(res.status).toBe(201);
    expect(res.body.state).toBe('disputed');
    expect(res.body.discrepancies).toBeGreaterThan(0);
    const queue = (await curator.get('/api/reconciliation')).body.items;
    expect(queue.some((q: { assignmentId: number }) => q.assignmentId === res.body.id)).toBe(true);
  });

  it('a draft claim keeps its values; the second coder gets a fresh sheet; comparing waits for both', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Halfmoon', year: 2018 });
    const x1 = await claim(coder1, ref);
    await fill(coder1, x1, luminanceSheet({ mean1: 688 }));
    const res = await assign(ref);
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ state: 'coding', adopted: [{ extractionId: x1, coder: 'coder1', state: 'draft' }] });
    const draft = (await coder1.get(`/api/extractions/${x1}`)).body;
    expect(draft.extraction).toMatchObject({ state: 'draft', assignmentId: res.body.id });
    expect(draft.studies[0].effects[0].reported.mean1).toBe(688);
    const fresh = res.body.extractionIds.find((id: number) => id !== x1);
    const second = (await coder2.get(`/api/extractions/${fresh}`)).body;
    expect(second.extraction.assignmentId).toBe(res.body.id);
    // blind: the other coder's draft stays closed
    expect((await coder2.get(`/api/extractions/${x1}`)).status).toBe(403);
  });

  it('the claim list does not offer a reference someone already claimed, and the assignment screen shows claims', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Amberline', year: 2019 });
    const offered = async (who: Agent) => (await who.get('/api/extractions/claimable?pageSize=100')).body.items.some((r: { id: number }) => r.id === ref);
    expect(await offered(coder1)).toBe(true);
    expect(await offered(coder2)).toBe(true);
    const x1 = await claim(coder1, ref);
    expect(await offered(coder2)).toBe(false);
    expect(await offered(coder1)).toBe(false);
    const cands = (await curator.get('/api/assignments/candidates?pageSize=100')).body.items;
    const row = cands.find((c: { id: number }) => c.id === ref);
    expect(row.claims).toEqual([{ extractionId: x1, coderId: ids.get('coder1'), coder: 'coder1', state: 'draft' }]);
    await submit(coder1, x1, await fill(coder1, x1));
    const after = (await curator.get('/api/assignments/candidates?pageSize=100')).body.items.find((c: { id: number }) => c.id === ref);
    expect(after.claims[0].state).toBe('submitted');
  });

  it('a pair that leaves a claimant out is refused, naming who claimed it', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Stillwater', year: 2020 });
    await claim(coder1, ref);
    await t.ctx.db('user_roles').insert({ user_id: ids.get('reviewer'), role: 'contributor' }).onConflict(['user_id', 'role']).ignore();
    const res = await assign(ref, 'coder2', 'reviewer');
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/@coder1 \(draft\) already claimed this reference/);
    expect(Number((await t.ctx.db('assignments').where({ reference_id: ref }).count({ n: '*' }).first())?.n)).toBe(0);
    await t.ctx.db('user_roles').where({ user_id: ids.get('reviewer'), role: 'contributor' }).delete();
  });
});
