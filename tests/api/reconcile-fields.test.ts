import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { pairDetailSchema, reconciledPairSchema } from '../../shared/schemas/reconciliation.js';
import type { SheetInput } from '../../shared/schemas/extraction.js';
import { currentRegistryVersion } from '../../server/repositories/registry-version.js';
import { anonymous, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { codingTeam } from '../support/coding-team.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

type Disc = { id: number; field: string; path: string; label: string; impliedA: { effect: number | null; label: string }[]; impliedB: { effect: number | null }[] };

// Field-by-field reconciliation in one step: each differing field with the effects either coding gives, then every
// decision and the settled record in one transaction.
describe('reconciling a disputed pair field by field in one transaction', () => {
  let t: TestApp;
  let curator: Agent;
  let coder1: Agent;
  let coder2: Agent;
  let ids: Map<string, number>;
  let assignmentId: number;
  let discs: Disc[];
  let version: number;

  const code = async (who: Agent, sheet: SheetInput) => {
    const x = (await who.get('/api/extractions')).body.items.find((i: { assignmentId: number | null }) => i.assignmentId === assignmentId);
    const cur = (await who.get(`/api/extractions/${x.id}`)).body.extraction;
    const saved = await who.put(`/api/extractions/${x.id}`).send({ version: cur.version, sheet });
    expect(saved.status).toBe(200);
    return who.post(`/api/extractions/${x.id}/submit`).send({ version: saved.body.version });
  };
  const resolvedCount = async () => Number((await t.ctx.db('discrepancies').where({ assignment_id: assignmentId, status: 'resolved' }).count({ n: '*' }))[0].n);
  const auditCount = async () => Number((await t.ctx.db('audit_log').count({ n: '*' }))[0].n);
  const byField = (f: string) => discs.find((d) => d.field === f)!;

  beforeAll(async () => {
    ({ t, ids, curator, coder1, coder2 } = await codingTeam());
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Quillfeather', year: 2018 });
    const made = await curator.post('/api/assignments').send({ referenceId: ref, coder1Id: ids.get('coder1'), coder2Id: ids.get('coder2') });
    expect(made.status).toBe(201);
    assignmentId = made.body.id;
    expect((await code(coder1, luminanceSheet({ mean1: 650 }))).status).toBe(200);
    const b = luminanceSheet({ mean1: 720, n: 22 });
    b.studies![0].task = 'bisection';
    const second = await code(coder2, b);
    expect(second.body.state).toBe('disputed');
  });
  afterAll(() => t.close());

  it('shows each differing field with both values and the effect each coding gives there', async () => {
    const res = await curator.get(`/api/reconciliation/${assignmentId}`);
    expect(res.status).toBe(200);
    const pair = pairDetailSchema.parse(res.body);
    discs = res.body.discrepancies;
    version = pair.assignment.version;
    expect(discs.map((d) => d.field).sort()).toEqual(['effect', 'n1', 'task']);
    const a = pair.a!.studies[0].effects[0].computed!;
    const b = pair.b!.studies[0].effects[0].computed!;
    expect(a.effect).not.toBeCloseTo(b.effect, 2);
    // the effect's own row and a study field's row both carry the effect of each side (the study's only effect here)
    for (const d of discs) {
      expect(d.impliedA).toHaveLength(1);
      expect(d.impliedA[0].effect).toBe(a.effect);
      expect(d.impliedB[0].effect).toBe(b.effect);
      expect(d.impliedA[0].label).toBe('Study 1, effect 1 (bright vs dim)');
    }
    expect(byField('n1')).toMatchObject({ valueA: 20, valueB: 22, status: 'open', resolution: null });
  });

  it('refuses a save that leaves a field undecided, a stale version, a bad own value, an unknown or twice-decided field; nothing is written', async () => {
    const before = { resolved: await resolvedCount(), audit: await auditCount(), registry: await currentRegistryVersion(t.ctx.db) };
    const send = (body: object) => curator.post(`/api/reconciliation/${assignmentId}/reconcile`).send(body);
    const two = [
      { discrepancyId: byField('n1').id, resolution: 'b' },
      { discrepancyId: byField('task').id, resolution: 'a' },
    ];
    const missing = await send({ version, rationale: 'Checked against Table 2.', decisions: two });
    expect(missing.status).toBe(422);
    expect(missing.body.error.message).toMatch(/Decide every differing field: 1 left open \(Study 1, effect 1: effect size and variance\)/);

    const stale = await send({ version: version - 1, rationale: 'Checked against Table 2.', decisions: [...two, { discrepancyId: byField('effect').id, resolution: 'a' }] });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed since you opened it/);

    const badValue = await send({ version, rationale: 'Checked.', decisions: [two[0], { discrepancyId: byField('task').id, resolution: 'value', value: 'guessing' }, { discrepancyId: byField('effect').id, resolution: 'a' }] });
    expect(badValue.status).toBe(400);
    expect(badValue.body.error.details[0].path).toBe('body.decisions.1.value');

    const badEffect = await send({ version, rationale: 'Checked.', decisions: [...two, { discrepancyId: byField('effect').id, resolution: 'value', value: { form: 'smd', reported: { mean1: 650, sd1: -3, n1: 20, mean2: 610, sd2: 75, n2: 20 } } }] });
    expect(badEffect.status).toBe(400);
    expect(badEffect.body.error.details[0].path).toMatch(/^body\.decisions\.2\.value\.reported/);

    const unknown = await send({ version, rationale: 'Checked.', decisions: [...two, { discrepancyId: 999999, resolution: 'a' }] });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0]).toEqual({ path: 'body.decisions.2.discrepancyId', message: 'no discrepancy 999999 in this pair' });

    const twice = await send({ version, rationale: 'Checked.', decisions: [...two, two[0]] });
    expect(twice.status).toBe(400);
    expect(twice.body.error.details.map((d: { path: string }) => d.path)).toContain('body.decisions.2.discrepancyId');

    const unchosen = await send({ version, rationale: 'Checked.', decisions: [{ discrepancyId: byField('n1').id }] });
    expect(unchosen.status).toBe(400);
    expect(unchosen.body.error.details[0]).toMatchObject({ path: 'body.decisions.0.resolution', message: 'choose coder A, coder B or your own value' });

    expect({ resolved: await resolvedCount(), audit: await auditCount(), registry: await currentRegistryVersion(t.ctx.db) }).toEqual(before);
  });

  it('coders, readers and the signed-out cannot reconcile', async () => {
    const body = { version, rationale: 'mine', decisions: [{ discrepancyId: byField('n1').id, resolution: 'a' }] };
    expect((await coder1.post(`/api/reconciliation/${assignmentId}/reconcile`).send(body)).status).toBe(403);
    const reader = await signIn(t.app, 'reader');
    expect((await reader.post(`/api/reconciliation/${assignmentId}/reconcile`).send(body)).status).toBe(403);
    expect((await anonymous(t.app).post(`/api/reconciliation/${assignmentId}/reconcile`).send(body)).status).toBe(401);
    expect(await resolvedCount()).toBe(0);
  });

  it('settles every decision and the record at once: B’s sample size, an own task, A’s effect; audited, registry grows, the pair closes', async () => {
    const registry = await currentRegistryVersion(t.ctx.db);
    const res = await curator.post(`/api/reconciliation/${assignmentId}/reconcile`).send({
      version,
      rationale: 'Both read against the published Table 2.',
      decisions: [
        { discrepancyId: byField('n1').id, resolution: 'b', note: 'Two late participants are in the table.' },
        { discrepancyId: byField('task').id, resolution: 'value', value: 'verbal_estimation' },
        { discrepancyId: byField('effect').id, resolution: 'a' },
      ],
    });
    expect(res.status).toBe(200);
    const out = reconciledPairSchema.parse(res.body);
    expect(out).toMatchObject({ assignmentId, decided: 3 });
    expect(out.registryVersion).toBeGreaterThan(registry);

    const record = (await anonymous(t.app).get(`/api/records/${out.recordId}`)).body;
    const s = record.studies[0];
    expect(s).toMatchObject({ n1: 22, task: 'verbal_estimation' });
    expect(s.effects[0].reported.mean1).toBe(650);
    expect(s.effects[0].computed.effect).toBe(byField('effect').impliedA[0].effect);

    const rows = await t.ctx.db('discrepancies').where({ assignment_id: assignmentId }).orderBy('id');
    expect(rows.every((r) => r.status === 'resolved' && r.resolved_by === ids.get('curator'))).toBe(true);
    expect(rows.find((r) => r.field === 'n1')).toMatchObject({ resolution: 'b', rationale: 'Two late participants are in the table.' });
    expect(rows.find((r) => r.field === 'task')).toMatchObject({ resolution: 'value', resolved_value: 'verbal_estimation', rationale: 'Both read against the published Table 2.' });

    const audit = await t.ctx.db('audit_log').where({ actor_id: ids.get('curator') }).whereIn('action', ['discrepancy.resolve', 'assignment.settle']).orderBy('id');
    expect(audit.map((a) => a.action)).toEqual(['discrepancy.resolve', 'discrepancy.resolve', 'discrepancy.resolve', 'assignment.settle']);
    expect(audit[3].details).toMatchObject({ recordId: out.recordId, decided: 3, oneStep: true });

    const pair = (await curator.get(`/api/reconciliation/${assignmentId}`)).body;
    expect(pair.assignment).toMatchObject({ state: 'settled', recordId: out.recordId });
    const again = await curator.post(`/api/reconciliation/${assignmentId}/reconcile`).send({ version: pair.assignment.version, rationale: 'again', decisions: [{ discrepancyId: byField('n1').id, resolution: 'a' }] });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/This pair is settled/);
  });
});
