import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSettledRecord } from '../../server/services/settlement.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedSet } from './syntheses-fixtures.js';

const body = { filters: { manipulation: 'luminance', outcome: 'duration_distortion', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };

describe('identical snapshot requests point to one snapshot', () => {
  let t: TestApp;
  let reviewer: Agent;
  let set: Awaited<ReturnType<typeof settleInventedSet>>;
  const count = async () => Number((await t.ctx.db('snapshots').count({ n: '*' }).first())!.n);
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    set = await settleInventedSet(t.ctx.db, 'luminance');
    reviewer = await signIn(t.app, 'reviewer');
  });
  afterAll(() => t.close());

  it('saved twice (keys in another order, defaults spelled out): 201 then 200 with the same snapshot', async () => {
    const first = await reviewer.post('/api/snapshots').send(body);
    expect(first.status).toBe(201);
    expect(first.body.existing).toBe(false);
    const reordered = { dependence: { r: 0.5, mode: 'aggregate' }, hksj: false, method: 'DL', filters: { metric: 'g_s', outcome: 'duration_distortion', manipulation: 'luminance' }, level: 0.95 };
    const again = await reviewer.post('/api/snapshots').send(reordered);
    expect(again.status).toBe(200);
    expect(again.body).toEqual({ ...first.body, existing: true });
    expect(await count()).toBe(1);
    expect(Number((await t.ctx.db('audit_log').where({ action: 'snapshot.created' }).count({ n: '*' }).first())!.n)).toBe(1);
  });

  it('a different title, a different request or a moved registry is a new snapshot', async () => {
    const before = await count();
    const titled = await reviewer.post('/api/snapshots').send({ ...body, title: 'Named by hand' });
    expect(titled.status).toBe(201);
    const titledAgain = await reviewer.post('/api/snapshots').send({ ...body, title: 'Named by hand' });
    expect(titledAgain.status).toBe(200);
    expect(titledAgain.body.id).toBe(titled.body.id);
    const pm = await reviewer.post('/api/snapshots').send({ ...body, method: 'PM' });
    expect(pm.status).toBe(201);
    const plain = await reviewer.post('/api/snapshots').send(body);
    expect(plain.status).toBe(200);
    const sheet = structuredClone(set[0].sheet) as any;
    sheet.studies[0].effects[0].reported.mean1 = 900;
    await t.ctx.db.transaction((trx) => createSettledRecord(trx, { referenceId: set[0].referenceId, sheet, kind: 'edited' }));
    const moved = await reviewer.post('/api/snapshots').send(body);
    expect(moved.status).toBe(201);
    expect(moved.body.id).not.toBe(plain.body.id);
    expect(moved.body.registryVersion).toBeGreaterThan(plain.body.registryVersion);
    expect(await count()).toBe(before + 3);
  });

  it('saved at the same moment by several requests: one snapshot, one 201, the rest 200', async () => {
    const request = { ...body, method: 'REML', title: 'Concurrent saves' };
    const answers = await Promise.all(Array.from({ length: 5 }, () => reviewer.post('/api/snapshots').send(request)));
    expect(answers.map((a) => a.status).sort()).toEqual([200, 200, 200, 200, 201]);
    expect(new Set(answers.map((a) => a.body.id)).size).toBe(1);
    expect(Number((await t.ctx.db('snapshots').where({ title: 'Concurrent saves' }).count({ n: '*' }).first())!.n)).toBe(1);
  });
});
