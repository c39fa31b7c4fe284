import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { computeEffect } from '../../shared/stats/compute-effect.js';
import { querySettledEffects } from '../../server/repositories/effects.js';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { createSettledRecord } from '../../server/services/settlement.js';
import { reopenRecord, settleRecordDraft, withdrawRecord } from '../../server/services/records.js';
import { anonymous, createTestApp, resetDb, signIn, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

describe('settled effects: repository, registry version and GET /api/effects', () => {
  let t: TestApp;
  let refA: number;
  let refB: number;
  let curatorId: number;
  beforeAll(async () => {
    t = await createTestApp();
    const ids = await resetDb(t.ctx.db);
    curatorId = ids.get('curator')!;
    refA = await insertReference(t.ctx.db, { firstAuthor: 'Okonkwo', year: 2018 });
    refB = await insertReference(t.ctx.db, { firstAuthor: 'Lindqvist', year: 2021 });
  });
  afterAll(() => t.close());

  it('createSettledRecord stores the engine’s effect and bumps the registry version', async () => {
    const before = await currentRegistryVersion(t.ctx.db);
    const out = await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: refA, sheet: luminanceSheet(), actorId: curatorId }));
    expect(out.registryVersion).toBe(before + 1);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(before + 1);
    const rows = await querySettledEffects(t.ctx.db, { manipulation: 'luminance' });
    expect(rows).toHaveLength(1);
    const expected = computeEffect({ measure: 'smd', mean1: 650, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 });
    expect(rows[0].effect).toBeCloseTo(expected.effect, 12);
    expect(rows[0].variance).toBeCloseTo(expected.variance, 12);
    expect(rows[0]).toMatchObject({ referenceId: refA, referenceLabel: 'Okonkwo 2018', metric: 'g_s', outcome: 'duration_distortion', n: 40, design: 'between', standardMs: 600, studyId: out.studyIds[0] });
  });

  it('refuses an incomplete sheet with field paths and leaves nothing behind', async () => {
    const before = await currentRegistryVersion(t.ctx.db);
    const bad = luminanceSheet();
    (bad.studies![0].effects![0].reported as any).sd1 = -3;
    await expect(t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: refB, sheet: bad }))).rejects.toMatchObject({
      status: 400,
      details: [expect.objectContaining({ path: 'sheet.studies.0.effects.0.reported.sd1' })],
    });
    expect(await currentRegistryVersion(t.ctx.db)).toBe(before);
    expect(await t.ctx.db('extractions').where({ reference_id: refB }).count<{ count: number }[]>({ count: '*' })).toEqual([{ count: 0 }]);
  });

  it('filters by outcome, metric, design and year; GET /api/effects answers the contract to anyone', async () => {
    await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: refB, sheet: luminanceSheet({ mean1: 700 }) }));
    expect(await querySettledEffects(t.ctx.db, { yearFrom: 2020 })).toHaveLength(1);
    expect(await querySettledEffects(t.ctx.db, { metric: 'log_ratio' })).toHaveLength(0);
    expect(await querySettledEffects(t.ctx.db, { manipulation: ['luminance', 'size'], design: 'between' })).toHaveLength(2);
    const res = await anonymous(t.app).get('/api/effects?state=settled&manipulation=luminance&outcome=duration_distortion&page=1&pageSize=1&sort=effect&order=desc');
    expect(res.status).toBe(200);
    expect(res.body.total).toBe(2);
    expect(res.body.items).toHaveLength(1);
    expect(res.body.items[0]).toMatchObject({ referenceId: refB, outcome: 'duration_distortion', manipulation: 'luminance', metric: 'g_s' });
    for (const k of ['id', 'studyId', 'effect', 'variance']) expect(typeof res.body.items[0][k]).toBe('number');
    const bad = await anonymous(t.app).get('/api/effects?outcome=nonsense');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].path).toBe('query.outcome');
  });

  it('reopen keeps the old version, removes the effects until re-settled, and keeps studyId', async () => {
    const [row] = await querySettledEffects(t.ctx.db, { referenceId: refA });
    const v0 = await currentRegistryVersion(t.ctx.db);
    const reopened = await reopenRecord(t.ctx.db, curatorId, row.recordId, 'Table 2 was misread');
    expect(reopened.registryVersion).toBe(v0 + 1);
    expect(await querySettledEffects(t.ctx.db, { referenceId: refA })).toHaveLength(0);
    const old = await t.ctx.db('extractions').where({ id: row.recordId }).first();
    expect(old.state).toBe('settled');
    expect(old.superseded_by).toBe(reopened.recordId);
    await settleRecordDraft(t.ctx, curatorId, reopened.recordId, { rationale: 'checked against the paper' });
    const [again] = await querySettledEffects(t.ctx.db, { referenceId: refA });
    expect(again.studyId).toBe(row.studyId);
    expect(again.recordVersion).toBe(2);
    expect(again.id).not.toBe(row.id);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(v0 + 2);
  });

  it('withdrawn records and merged-away references leave the settled set', async () => {
    const [b] = await querySettledEffects(t.ctx.db, { referenceId: refB });
    await withdrawRecord(t.ctx.db, curatorId, b.recordId, 'duplicate publication of the same data');
    expect(await querySettledEffects(t.ctx.db, { referenceId: refB })).toHaveLength(0);
    const refC = await insertReference(t.ctx.db, { firstAuthor: 'Achterberg', year: 2015 });
    await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: refC, sheet: luminanceSheet() }));
    expect(await querySettledEffects(t.ctx.db, { referenceId: refC })).toHaveLength(1);
    await t.ctx.db('refs').where({ id: refC }).update({ merged_into: refA });
    expect(await querySettledEffects(t.ctx.db, { referenceId: refC })).toHaveLength(0);
  });

  it('a curator edits a settled effect: recomputed, versioned, stale edit gets 409 naming the editor', async () => {
    const curator = await signIn(t.app, 'curator');
    const [row] = await querySettledEffects(t.ctx.db, { referenceId: refA });
    const detail = await anonymous(t.app).get(`/api/effects/${row.id}`);
    expect(detail.status).toBe(200);
    const v0 = await currentRegistryVersion(t.ctx.db);
    const effect = { ...luminanceSheet().studies![0].effects![0], reported: { mean1: 680, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 } };
    const ok = await curator.patch(`/api/effects/${row.id}`).send({ version: detail.body.effect.version, reason: 'corrected mean', effect });
    expect(ok.status).toBe(200);
    const expected = computeEffect({ measure: 'smd', mean1: 680, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 });
    expect(ok.body.effect).toBeCloseTo(expected.effect, 12);
    expect(ok.body.registryVersion).toBe(v0 + 1);
    const stale = await curator.patch(`/api/effects/${row.id}`).send({ version: detail.body.effect.version, reason: 'again', effect });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed by curator/);
    const coder = await signIn(t.app, 'coder1');
    expect((await coder.patch(`/api/effects/${row.id}`).send({ version: 2, reason: 'x', effect })).status).toBe(403);
  });

  it('a curator withdraws one settled effect: it leaves the settled set and the registry version grows', async () => {
    const curator = await signIn(t.app, 'curator');
    const [row] = await querySettledEffects(t.ctx.db, { referenceId: refA });
    const v0 = await currentRegistryVersion(t.ctx.db);
    const res = await curator.post(`/api/effects/${row.id}/withdraw`).send({ reason: 'the same participants as another paper' });
    expect(res.status).toBe(200);
    expect(res.body.registryVersion).toBe(v0 + 1);
    expect(await querySettledEffects(t.ctx.db, { referenceId: refA })).toHaveLength(0);
    expect((await anonymous(t.app).get(`/api/effects/${row.id}`)).status).toBe(404);
    expect((await curator.post(`/api/effects/${row.id}/withdraw`).send({ reason: 'again please' })).status).toBe(409);
  });
});
