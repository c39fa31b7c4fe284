import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { describeAccess } from '../support/access.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';

describeAccess('the audit log for curators', [
  { method: 'get', path: '/api/audit', who: ['curator'], bad: { path: '/api/audit?from=yesterday' } },
  { method: 'get', path: '/api/admin/audit', who: ['admin'], bad: { path: '/api/admin/audit?to=2026-13-40' } },
]);

describe('audit log filters', () => {
  let t: TestApp;
  let curator: Agent;
  let ids: Map<string, number>;
  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
    curator = await signIn(t.app, 'curator');
    const entry = (actor: string | null, action: string, entityType: string, entityId: string, at: string) => ({
      actor_id: actor ? ids.get(actor)! : null,
      action,
      entity_type: entityType,
      entity_id: entityId,
      details: JSON.stringify({ role: 'reviewer', referenceId: 7 }),
      at,
    });
    await t.ctx.db('audit_log').insert([
      entry('admin', 'role.granted', 'user', '901', '2026-11-30T23:59:59Z'),
      entry('admin', 'role.revoked', 'user', '901', '2026-12-01T00:00:00Z'),
      entry('curator', 'record.settle', 'effect', '902', '2026-12-02T12:00:00Z'),
      entry(null, 'import.finish', 'import_batch', '903', '2026-12-03T23:59:59Z'),
      entry('coder1', 'extraction.save', 'extraction', '904', '2026-12-04T00:00:00Z'),
    ]);
  });
  afterAll(() => t.close());

  const ids_ = (body: { items: { entityId: string }[] }) => body.items.map((a) => a.entityId).filter((x) => Number(x) >= 901);

  it('filters by person (login, with or without @, or system), by action and by record', async () => {
    expect(ids_((await curator.get('/api/audit?actor=admin&entityType=user&entityId=901')).body)).toEqual(['901', '901']);
    expect(ids_((await curator.get('/api/audit?actor=@Curator&action=record.settle')).body)).toEqual(['902']);
    expect(ids_((await curator.get('/api/audit?actor=system&action=import.finish')).body)).toEqual(['903']);
    expect(ids_((await curator.get('/api/audit?action=role.revoked&entityId=901')).body)).toEqual(['901']);
    expect((await curator.get('/api/audit?actor=nobody-by-that-name')).body.total).toBe(0);
    const one = (await curator.get('/api/audit?entityType=effect&entityId=902')).body;
    expect(one.total).toBe(1);
    expect(one.items[0]).toMatchObject({ actorLogin: 'curator', action: 'record.settle', details: { role: 'reviewer', referenceId: 7 } });
  });

  it('filters by a range of days in UTC, both days included', async () => {
    const range = async (q: string) => ids_((await curator.get(`/api/audit?${q}`)).body).sort();
    expect(await range('from=2026-12-01&to=2026-12-03')).toEqual(['901', '902', '903']);
    expect(await range('from=2026-12-04')).toEqual(['904']);
    expect(await range('to=2026-11-30')).toEqual(['901']);
    expect(await range('from=2026-12-02&to=2026-12-02')).toEqual(['902']);
  });

  it('refuses a day not given as a date, and a range that ends before it starts, in words', async () => {
    const bad = await curator.get('/api/audit?from=last-week');
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].message).toMatch(/enter a date as year-month-day/);
    const backwards = await curator.get('/api/audit?from=2026-12-04&to=2026-12-01');
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.details[0].message).toBe('the first day must not be after the last day');
  });
});
