import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { computeEffect } from '../../shared/stats/compute-effect.js';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

const mailbox = () => process.env.MAILBOX_URL!;

async function waitForMail(to: string, subject: RegExp, timeoutMs = 20_000) {
  const until = Date.now() + timeoutMs;
  for (;;) {
    const r = await fetch(`${mailbox()}/messages?to=${encodeURIComponent(to)}`);
    const body = (await r.json()) as { messages: { subject: string; text: string }[] };
    const hit = body.messages.find((m) => subject.test(m.subject));
    if (hit) return hit;
    if (Date.now() > until) throw new Error(`no mail to ${to} matching ${subject}; got ${body.messages.map((m) => m.subject).join(' | ')}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

describe('double coding over the API: assign, blind coding, dispute, reconcile, settle, mail', () => {
  let t: TestApp;
  let curator: Agent;
  let coder1: Agent;
  let coder2: Agent;
  let ids: Map<string, number>;
  let refId: number;
  let assignmentId: number;
  let ex1: number;
  let ex2: number;

  beforeAll(async () => {
    t = await createTestApp({ jobs: true });
    ids = await resetDb(t.ctx.db);
    await fetch(`${mailbox()}/messages`, { method: 'DELETE' });
    refId = await insertReference(t.ctx.db, { firstAuthor: 'Marchetti', year: 2019, title: 'Bright discs last longer' });
    curator = await signIn(t.app, 'curator');
    coder1 = await signIn(t.app, 'coder1');
    coder2 = await signIn(t.app, 'coder2');
  });
  afterAll(() => t.close());

  it('a curator assigns the reference to two coders, who are mailed', async () => {
    const res = await curator.post('/api/assignments').send({ referenceId: refId, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(res.status).toBe(201);
    assignmentId = res.body.id;
    const again = await curator.post('/api/assignments').send({ referenceId: refId, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(again.status).toBe(409);
    const mine1 = await coder1.get('/api/extractions');
    const mine2 = await coder2.get('/api/extractions');
    expect(mine1.body.items).toHaveLength(1);
    ex1 = mine1.body.items[0].id;
    ex2 = mine2.body.items[0].id;
    expect(mine1.body.items[0]).toMatchObject({ state: 'draft', referenceId: refId });
    const mail = await waitForMail('meilin.hartwell@tempora-lab.example', /please code Marchetti 2019/);
    expect(mail.text).toContain(`/extractions/${ex1}`);
  });

  it('saves drafts with server-computed effects; a stale save gets 409 naming who saved', async () => {
    const s1 = await coder1.put(`/api/extractions/${ex1}`).send({ version: 1, sheet: luminanceSheet({ mean1: 650 }) });
    expect(s1.status).toBe(200);
    expect(s1.body.version).toBe(2);
    const expected = computeEffect({ measure: 'smd', mean1: 650, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 });
    expect(s1.body.studies[0].effects[0].computed.effect).toBeCloseTo(expected.effect, 12);
    const stale = await coder1.put(`/api/extractions/${ex1}`).send({ version: 1, sheet: luminanceSheet({ mean1: 651 }) });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed by coder1/);
    const s2 = await coder2.put(`/api/extractions/${ex2}`).send({ version: 1, sheet: luminanceSheet({ mean1: 700 }) });
    expect(s2.status).toBe(200);
  });

  it('coding is blind: a coder asking for the other coder’s extraction is refused', async () => {
    const res = await coder1.get(`/api/extractions/${ex2}`);
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/blind/);
    expect((await coder2.put(`/api/extractions/${ex1}`).send({ version: 2, sheet: luminanceSheet() })).status).toBe(403);
    expect((await curator.get(`/api/extractions/${ex2}`)).status).toBe(200);
  });

  it('invalid statistics are refused on submit with field errors; the sheet stays a draft', async () => {
    const bad = luminanceSheet();
    (bad.studies![0].effects![0].reported as any).sd2 = 0;
    const saved = await coder1.put(`/api/extractions/${ex1}`).send({ version: 2, sheet: bad });
    expect(saved.status).toBe(200);
    expect(saved.body.studies[0].effects[0].computed).toBeNull();
    const res = await coder1.post(`/api/extractions/${ex1}/submit`).send({ version: 3 });
    expect(res.status).toBe(400);
    expect(res.body.error.details.map((d: any) => d.path)).toContain('sheet.studies.0.effects.0.reported.sd2');
    const bodyBad = await coder1.put(`/api/extractions/${ex1}`).send({ version: 3, sheet: { studies: [{ design: 'sideways', effects: [{ reported: { sd1: 'abc' } }] }] } });
    expect(bodyBad.status).toBe(400);
    expect(bodyBad.body.error.details.map((d: any) => d.path)).toEqual(expect.arrayContaining(['body.sheet.studies.0.design', 'body.sheet.studies.0.effects.0.reported.sd1']));
    expect((await t.ctx.db('extractions').where({ id: ex1 }).first()).state).toBe('draft');
    const fixed = await coder1.put(`/api/extractions/${ex1}`).send({ version: 3, sheet: luminanceSheet({ mean1: 650 }) });
    expect(fixed.body.version).toBe(4);
  });

  it('both submit: the server compares and marks the pair disputed with one discrepancy; curators are mailed', async () => {
    const a = await coder1.post(`/api/extractions/${ex1}/submit`).send({ version: 4 });
    expect(a.status).toBe(200);
    expect(a.body.state).toBe('submitted');
    const b = await coder2.post(`/api/extractions/${ex2}/submit`).send({ version: 2 });
    expect(b.status).toBe(200);
    expect(b.body).toMatchObject({ state: 'disputed', discrepancies: 1 });
    // still blind while disputed
    expect((await coder2.get(`/api/extractions/${ex1}`)).status).toBe(403);
    const mail = await waitForMail('dario.okonkwo@interval-group.example', /needs reconciliation/);
    expect(mail.text).toContain('effect size and variance');
  });

  it('the curator settles the discrepancy with a rationale; the settled effect is what the registry returns', async () => {
    const queue = await curator.get('/api/reconciliation');
    expect(queue.status).toBe(200);
    expect(queue.body.items).toEqual([expect.objectContaining({ assignmentId, openDiscrepancies: 1 })]);
    const pair = await curator.get(`/api/reconciliation/${assignmentId}`);
    expect(pair.body.discrepancies).toHaveLength(1);
    const d = pair.body.discrepancies[0];
    expect(d.path).toBe('studies.0.effects.0.effect');
    const early = await curator.post(`/api/reconciliation/${assignmentId}/settle`).send({ rationale: '' });
    expect(early.status).toBe(422);
    const noReason = await curator.put(`/api/reconciliation/${assignmentId}/discrepancies/${d.id}`).send({ resolution: 'b', rationale: '' });
    expect(noReason.status).toBe(400);
    const resolved = await curator.put(`/api/reconciliation/${assignmentId}/discrepancies/${d.id}`).send({ resolution: 'b', rationale: 'Table 2 gives 700 ms for bright discs' });
    expect(resolved.status).toBe(200);
    const v0 = await currentRegistryVersion(t.ctx.db);
    const settled = await curator.post(`/api/reconciliation/${assignmentId}/settle`).send({ rationale: 'checked against the paper' });
    expect(settled.status).toBe(200);
    expect(await currentRegistryVersion(t.ctx.db)).toBe(v0 + 1);

    const effects = await anonymous(t.app).get('/api/effects?state=settled&manipulation=luminance&outcome=duration_distortion');
    expect(effects.body.total).toBe(1);
    const expected = computeEffect({ measure: 'smd', mean1: 700, sd1: 80, n1: 20, mean2: 610, sd2: 75, n2: 20 });
    expect(effects.body.items[0].effect).toBeCloseTo(expected.effect, 12);
    expect(effects.body.items[0].referenceId).toBe(refId);
    // once settled, each coder may see the other's sheet
    expect((await coder1.get(`/api/extractions/${ex2}`)).status).toBe(200);
    expect((await t.ctx.db('assignments').where({ id: assignmentId }).first()).state).toBe('settled');
  });

  it('the coders got their "settled" mails in the fake SMTP', async () => {
    for (const to of ['meilin.hartwell@tempora-lab.example', 'tomasz.brandvold@pacemaker-unit.example']) {
      const m = await waitForMail(to, /is settled/);
      expect(m.text).toMatch(/A curator reconciled the two codings/);
    }
    const admin = await signIn(t.app, 'admin');
    const log = await admin.get('/api/mail/log?status=sent');
    expect(log.status).toBe(200);
    expect(log.body.items.map((m: any) => m.kind)).toEqual(expect.arrayContaining(['assignment', 'disputed', 'settled']));
    const box = await admin.get('/api/mail/mailbox');
    expect(box.status).toBe(200);
    expect(box.body.total).toBeGreaterThanOrEqual(5);
  });

  it('a matched pair settles by itself', async () => {
    const ref2 = await insertReference(t.ctx.db, { firstAuthor: 'Ferreira', year: 2022 });
    const res = await curator.post('/api/assignments').send({ referenceId: ref2, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    const [e1, e2] = res.body.extractionIds;
    await coder1.put(`/api/extractions/${e1}`).send({ version: 1, sheet: luminanceSheet({ mean1: 640 }) });
    // 640.01 vs 640 moves g by far less than the stated tolerance
    await coder2.put(`/api/extractions/${e2}`).send({ version: 1, sheet: luminanceSheet({ mean1: 640.01 }) });
    await coder1.post(`/api/extractions/${e1}/submit`).send({ version: 2 });
    const b = await coder2.post(`/api/extractions/${e2}/submit`).send({ version: 2 });
    expect(b.body).toMatchObject({ state: 'settled', pairState: 'settled' });
    const effects = await anonymous(t.app).get(`/api/effects?manipulation=luminance`);
    expect(effects.body.total).toBe(2);
    const agreement = await curator.get('/api/agreement');
    expect(agreement.status).toBe(200);
    expect(agreement.body.overall.pairs).toBe(2);
    const design = agreement.body.overall.categorical.find((c: any) => c.field === 'design');
    expect(design.percentAgreement).toBe(1);
    // 2 pairs of values: no ICC, and the answer says why
    expect(agreement.body.overall.effectSizes[0]).toMatchObject({ metric: 'g_s', items: 2, icc: null });
    expect(agreement.body.overall.effectSizes[0].iccNote).toMatch(/2 pairs of values; an ICC needs at least 5/);
  });

  it('a failed transaction leaves nothing behind; audit entries cannot be changed', async () => {
    const before = await t.ctx.db('assignments').count<{ c: number }[]>({ c: '*' });
    const ref3 = await insertReference(t.ctx.db);
    const res = await curator.post('/api/assignments').send({ referenceId: ref3, coder1Id: ids.get('coder1'), coder2Id: ids.get('reader') });
    expect(res.status).toBe(400);
    expect(await t.ctx.db('assignments').count<{ c: number }[]>({ c: '*' })).toEqual(before);
    expect(await t.ctx.db('extractions').where({ reference_id: ref3 })).toHaveLength(0);
    const entry = await t.ctx.db('audit_log').where({ action: 'discrepancy.resolve' }).first();
    expect(entry.details.rationale).toMatch(/Table 2/);
    await expect(t.ctx.db('audit_log').where({ id: entry.id }).update({ action: 'tampered' })).rejects.toThrow(/append-only/);
    await expect(t.ctx.db('audit_log').where({ id: entry.id }).delete()).rejects.toThrow(/append-only/);
    const admin = await signIn(t.app, 'admin');
    for (const method of ['put', 'patch', 'delete'] as const) {
      expect((await admin[method](`/api/admin/audit/${entry.id}`).send({ action: 'x' })).status).toBe(404);
    }
  });
});

describe('claiming: a contributor claims a reference, a curator pairs the claim', () => {
  let t: TestApp;
  let ids: Map<string, number>;
  beforeAll(async () => {
    t = await createTestApp();
    ids = await resetDb(t.ctx.db);
  });
  afterAll(() => t.close());

  it('the claimed sheet joins the pair; claiming twice or an assigned reference is refused', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Zielinski', year: 2012 });
    const coder1 = await signIn(t.app, 'coder1');
    const list = await coder1.get('/api/extractions/claimable');
    expect(list.body.items.map((r: any) => r.id)).toContain(ref);
    const claim = await coder1.post('/api/extractions').send({ referenceId: ref });
    expect(claim.status).toBe(201);
    expect((await coder1.post('/api/extractions').send({ referenceId: ref })).status).toBe(409);
    expect((await coder1.get('/api/extractions/claimable')).body.items.map((r: any) => r.id)).not.toContain(ref);
    await coder1.put(`/api/extractions/${claim.body.id}`).send({ version: 1, sheet: luminanceSheet() });
    const curator = await signIn(t.app, 'curator');
    const pair = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(pair.status).toBe(201);
    expect(pair.body.extractionIds).toContain(claim.body.id);
    const kept = await coder1.get(`/api/extractions/${claim.body.id}`);
    expect(kept.body.extraction.assignmentId).toBe(pair.body.id);
    expect(kept.body.studies).toHaveLength(1);
    const coder2 = await signIn(t.app, 'coder2');
    expect((await coder2.post('/api/extractions').send({ referenceId: ref })).status).toBe(409);
  });
});
