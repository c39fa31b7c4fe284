import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSettledRecord } from '../../server/services/settlement.js';
import type { Agent, TestApp } from '../support/test-app.js';
import { codingTeam } from '../support/coding-team.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

// Writes on a sheet or record the caller may not see answer exactly like a missing id (as reads do);
// the other coder of a pair, whom the assignment already told, keeps its 403.
describe('writes on a hidden coding sheet or record draft answer the 404 of a missing id', () => {
  let t: TestApp;
  let ids: Map<string, number>;
  let curator: Agent;
  let coder1: Agent;
  let coder2: Agent;

  const put = (agent: Agent, id: number, version = 1) => agent.put(`/api/extractions/${id}`).send({ version, sheet: luminanceSheet() });
  const submit = (agent: Agent, id: number, version = 1) => agent.post(`/api/extractions/${id}/submit`).send({ version });

  async function expectMissing(agent: Agent, id: number) {
    const missingPut = await put(agent, 999999);
    const missingSubmit = await submit(agent, 999999);
    expect(missingPut.status).toBe(404);
    expect(missingSubmit.status).toBe(404);
    const hiddenPut = await put(agent, id);
    expect(hiddenPut.status).toBe(404);
    expect(hiddenPut.body).toEqual({ error: { ...missingPut.body.error, message: `No extraction ${id}.` } });
    const hiddenSubmit = await submit(agent, id);
    expect(hiddenSubmit.status).toBe(404);
    expect(hiddenSubmit.body).toEqual({ error: { ...missingSubmit.body.error, message: `No extraction ${id}.` } });
  }

  beforeAll(async () => {
    ({ t, ids, curator, coder1, coder2 } = await codingTeam());
  });
  afterAll(() => t.close());

  it('another contributor saving or submitting a claimed sheet gets the missing-id answer; nothing changes', async () => {
    const ref = await insertReference(t.ctx.db);
    const claim = await coder1.post('/api/extractions').send({ referenceId: ref });
    expect(claim.status).toBe(201);
    const id = claim.body.id as number;
    await expectMissing(coder2, id);
    const row = await t.ctx.db('extractions').where({ id }).first();
    expect(row).toMatchObject({ state: 'draft', version: 1 });
    // a curator can see the sheet, so the refusal says why
    const byCurator = await put(curator, id);
    expect(byCurator.status).toBe(403);
    expect(byCurator.body.error.message).toMatch(/Only its coder can edit/);
    expect((await put(coder1, id)).status).toBe(200);
  });

  it('the other coder of a pair keeps the 403: the assignment already shows the sheet exists', async () => {
    const ref = await insertReference(t.ctx.db);
    const assigned = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(assigned.status).toBe(201);
    const sheet = await t.ctx.db('extractions').where({ assignment_id: assigned.body.id, coder_id: ids.get('coder1') }).first('id');
    for (const res of [await put(coder2, sheet.id), await submit(coder2, sheet.id)]) {
      expect(res.status).toBe(403);
      expect(res.body.error.message).toMatch(/Only its coder can edit/);
    }
  });

  it('a contributor writing to a reopened record’s draft (curators only) gets the missing-id answer', async () => {
    const ref = await insertReference(t.ctx.db);
    const settled = await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: ref, sheet: luminanceSheet() }));
    const reopened = await curator.post(`/api/records/${settled.recordId}/reopen`).send({ reason: 'misread table 2' });
    expect(reopened.status).toBe(201);
    const draftId = reopened.body.recordId as number;
    const before = await t.ctx.db('extractions').where({ id: draftId }).first('version');
    await expectMissing(coder1, draftId);
    expect((await t.ctx.db('extractions').where({ id: draftId }).first('version')).version).toBe(before.version);
    // curators see it: their refusal keeps its reason
    const bySubmit = await submit(curator, draftId, before.version);
    expect(bySubmit.status).toBe(422);
    expect(bySubmit.body.error.message).toMatch(/settled, not submitted/);
    // a settled record anyone can read still says why a contributor cannot edit it
    const onRecord = await put(coder1, settled.recordId);
    expect(onRecord.status).toBe(403);
    expect(onRecord.body.error.message).toMatch(/Only curators edit/);
  });
});
