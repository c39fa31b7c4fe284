import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference } from './extraction-fixtures.js';

describe('POST /api/assignments under concurrency', () => {
  let t: TestApp;
  let curator: Agent;
  let ids: Map<string, number>;

  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
    curator = await signIn(t.app, 'curator');
  });
  afterAll(() => t.close());

  it('10 identical requests at once make one active assignment (the rest 409) and one mail per coder', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Manyhands', year: 2021 });
    const body = { referenceId: ref, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') };
    const answers = await Promise.all(Array.from({ length: 10 }, () => curator.post('/api/assignments').send(body)));
    const statuses = answers.map((a) => a.status).sort();
    expect(statuses).toEqual([201, ...Array(9).fill(409)]);
    for (const a of answers.filter((x) => x.status === 409)) expect(a.body.error.message).toMatch(/already being double coded/);
    expect((await t.ctx.db('assignments').where({ reference_id: ref })).length).toBe(1);
    expect((await t.ctx.db('extractions').where({ reference_id: ref, kind: 'coding' })).length).toBe(2);
    const mails = await t.ctx.db('mail_log').where({ kind: 'assignment' }).whereILike('subject', '%Manyhands 2021%');
    expect(mails.map((m) => m.to_address).sort()).toEqual(['meilin.hartwell@tempora-lab.example', 'tomasz.brandvold@pacemaker-unit.example']);
  });

  it('the database itself refuses a second active pair of one reference', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Doublelock', year: 2022 });
    const row = { reference_id: ref, coder1_id: ids.get('coder1'), coder2_id: ids.get('coder2'), assigned_by: ids.get('curator') };
    await t.ctx.db('assignments').insert(row);
    await expect(t.ctx.db('assignments').insert(row)).rejects.toMatchObject({ code: '23505' });
    // a finished pair does not block a new one
    await t.ctx.db('assignments').where({ reference_id: ref }).update({ state: 'settled' });
    await t.ctx.db('assignments').insert(row);
  });
});
