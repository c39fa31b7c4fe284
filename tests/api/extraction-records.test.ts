import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { createSettledRecord } from '../../server/services/settlement.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

describe('settled records over the API: read, reopen with a reason, edit the new version, settle, withdraw', () => {
  let t: TestApp;
  let curator: Agent;
  let refId: number;
  let recordId: number;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    refId = await insertReference(t.ctx.db, { firstAuthor: 'Quintero', year: 2017 });
    recordId = (await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: refId, sheet: luminanceSheet() }))).recordId;
    curator = await signIn(t.app, 'curator');
  });
  afterAll(() => t.close());

  it('anyone reads a settled record; a reopened draft is for curators only', async () => {
    const res = await anonymous(t.app).get(`/api/records/${recordId}`);
    expect(res.status).toBe(200);
    expect(res.body.extraction).toMatchObject({ kind: 'settled', state: 'settled', recordVersion: 1 });
    expect(res.body.studies[0].effects[0].computed.metric).toBe('g_s');
    const v0 = await currentRegistryVersion(t.ctx.db);
    const reopened = await curator.post(`/api/records/${recordId}/reopen`).send({ reason: 'n2 was 22, not 20' });
    expect(reopened.status).toBe(201);
    expect(reopened.body.registryVersion).toBe(v0 + 1);
    const draftId = reopened.body.recordId;
    // a draft hidden from the caller answers exactly like an id that does not exist
    const hidden = await anonymous(t.app).get(`/api/records/${draftId}`);
    const missing = await anonymous(t.app).get('/api/records/999999');
    expect(hidden.status).toBe(404);
    expect(hidden.body).toEqual({ error: { ...missing.body.error, message: `No extraction ${draftId}.` } });
    expect((await anonymous(t.app).get(`/api/effects?referenceId=${refId}`)).body.total).toBe(0);
    const again = await curator.post(`/api/records/${recordId}/reopen`).send({ reason: 'twice' });
    expect(again.status).toBe(409);

    const sheet = luminanceSheet();
    (sheet.studies![0] as any).n2 = 22;
    (sheet.studies![0].effects![0].reported as any).n2 = 22;
    const saved = await curator.put(`/api/extractions/${draftId}`).send({ version: 1, sheet });
    expect(saved.status).toBe(200);
    const settled = await curator.post(`/api/records/${draftId}/settle`).send({ rationale: 'checked Table 1' });
    expect(settled.status).toBe(200);
    const effects = await anonymous(t.app).get(`/api/effects?referenceId=${refId}`);
    expect(effects.body.items[0]).toMatchObject({ n: 42, recordVersion: 2 });
    const history = await anonymous(t.app).get(`/api/records?referenceId=${refId}`);
    expect(history.body.records.map((r: any) => [r.recordVersion, r.current])).toEqual([[2, true], [1, false]]);
    expect(history.body.settlements.map((s: any) => s.kind)).toEqual(['reconciled', 'reopened', 'direct']);
    expect(history.body.settlements[1].rationale).toBe('n2 was 22, not 20');
  });

  it('withdrawing takes the record out of the registry and is refused twice', async () => {
    const current = (await anonymous(t.app).get(`/api/records?referenceId=${refId}`)).body.records[0].id;
    const res = await curator.post(`/api/records/${current}/withdraw`).send({ reason: 'data published twice' });
    expect(res.status).toBe(200);
    expect((await anonymous(t.app).get(`/api/effects?referenceId=${refId}`)).body.total).toBe(0);
    expect((await curator.post(`/api/records/${current}/withdraw`).send({ reason: 'again' })).status).toBe(409);
  });
});
