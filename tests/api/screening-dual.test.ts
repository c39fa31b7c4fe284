import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cohensKappaFromPairs } from '../../shared/agreement/cohens-kappa.js';
import { screeningBatchResultSchema, screeningQueueSchema, screeningResultSchema } from '../../shared/schemas/references.js';
import { screeningAgreementSchema, screeningConflictsSchema, screeningRuleSchema } from '../../shared/schemas/screening.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';
import { signIn, type Agent, type TestApp } from '../support/test-app.js';

describe('screening: two blind screeners, disagreements settled by a curator', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  let curator: Agent;
  let admin: Agent;
  const ids: number[] = [];
  const version = async (id: number): Promise<number> => (await curator.get(`/api/references/${id}`)).body.reference.version;
  const decide = async (who: Agent, id: number, body: object) => who.post(`/api/references/${id}/screening`).send({ ...body, version: await version(id) });
  const queueOf = async (who: Agent, stage = 'title_abstract') => screeningQueueSchema.parse((await who.get(`/api/screening/queue?limit=50&stage=${stage}`)).body).items;
  const whyOf = async (who: Agent, id: number) => (await queueOf(who)).find((i) => i.id === id)?.why.kind ?? 'absent';

  beforeAll(async () => {
    ({ t, coder, coder2, curator } = await screeningTeam());
    admin = await signIn(t.app, 'admin');
    const text = Array.from({ length: 8 }, (_, i) => bib(`d${i}`, { title: `Dual study ${i} on interval timing`, author: `Dual${i}, C`, year: String(2000 + i), doi: `10.5555/dual.${i}` })).join('\n');
    ids.push(...(await importBibtex(coder, text)));
  });
  afterAll(async () => {
    await t.close();
  });

  it('starts with one screener; a curator sets two (persisted, audited); bad input is refused in words', async () => {
    expect(screeningRuleSchema.parse((await coder.get('/api/screening/rule')).body).screeners).toBe(1);
    const bad = await curator.put('/api/screening/rule').send({ screeners: 3 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0].message).toMatch(/screeners must be 1 or 2/);
    expect((await coder.put('/api/screening/rule').send({ screeners: 2 })).status).toBe(403);
    const res = await curator.put('/api/screening/rule').send({ screeners: 2 });
    expect(res.status).toBe(200);
    expect(screeningRuleSchema.parse(res.body)).toMatchObject({ screeners: 2, updatedBy: { login: 'curator' } });
    expect((await coder.get('/api/screening/rule')).body.screeners).toBe(2);
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.rule' });
    expect(audit).toHaveLength(1);
    expect(audit[0].details).toMatchObject({ screeners: 2, previous: 1 });
  });

  it('keeps a first decision blind: the reference, lists, exports, the queue and the audit log show nothing of it', async () => {
    const v0 = await version(ids[0]);
    const res = await decide(coder, ids[0], { decision: 'excluded', reason: 'wrong_population' });
    expect(res.status).toBe(201);
    expect(screeningResultSchema.parse(res.body)).toMatchObject({ screeningStatus: 'unscreened', version: v0, dual: { decisionsIn: 1, settled: false } });
    for (const who of [coder2, curator]) {
      const detail = (await who.get(`/api/references/${ids[0]}`)).body;
      expect(detail.reference).toMatchObject({ screeningStatus: 'unscreened', version: v0 });
      expect(detail.screening).toEqual([]);
      const list = (await who.get('/api/references?pageSize=50')).body.items.find((r: { id: number }) => r.id === ids[0]);
      expect(list.screeningStatus).toBe('unscreened');
      const csl = await who.get(`/api/references/export?format=csl-json&ids=${ids[0]}`);
      expect(csl.status).toBe(200);
      expect(csl.text).not.toMatch(/wrong_population|Wrong population|excluded/i);
    }
    expect(await whyOf(coder, ids[0])).toBe('absent');
    expect(await whyOf(coder2, ids[0])).toBe('second_screener_needed');
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.vote', entity_id: ids[0] });
    expect(audit).toHaveLength(1);
    expect(JSON.stringify(audit[0].details)).not.toMatch(/excluded|wrong_population/);
  });

  it('refuses the same person as both screeners (409) without showing the other decision', async () => {
    const again = await decide(coder, ids[0], { decision: 'included' });
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already decided reference .* another screener/);
    const batch = await coder.post('/api/screening/decisions').send({ items: [{ refId: ids[0], version: await version(ids[0]) }], decision: 'excluded', reason: 'wrong_population' });
    expect(batch.status).toBe(409);
    expect(await t.ctx.db('screening_votes').where({ ref_id: ids[0] })).toHaveLength(1);
  });

  it('settles a record when the second screener agrees (one decision in the history, both votes settled)', async () => {
    const first = await decide(coder, ids[1], { decision: 'included' });
    expect(first.body.dual).toEqual({ decisionsIn: 1, settled: false });
    const second = await decide(coder2, ids[1], { decision: 'included' });
    expect(second.status).toBe(201);
    expect(screeningResultSchema.parse(second.body)).toMatchObject({ screeningStatus: 'awaiting_full_text', dual: { decisionsIn: 2, settled: true } });
    const detail = (await coder.get(`/api/references/${ids[1]}`)).body;
    expect(detail.reference.screeningStatus).toBe('awaiting_full_text');
    expect(detail.screening).toHaveLength(1);
    const votes = await t.ctx.db('screening_votes').where({ ref_id: ids[1] });
    expect(votes.map((v) => v.settled_by_decision)).toEqual([second.body.id, second.body.id]);
    // the full-text stage needs two decisions again
    expect((await queueOf(coder, 'full_text')).map((i) => i.id)).toContain(ids[1]);
  });

  it('sends a disagreement to the curator: out of both screeners’ queues, on the curator’s as a conflict, listed with both decisions', async () => {
    const second = await decide(coder2, ids[0], { decision: 'included' });
    expect(second.status).toBe(201);
    expect(second.body).toMatchObject({ screeningStatus: 'unscreened', dual: { decisionsIn: 2, settled: false } });
    expect(await whyOf(coder, ids[0])).toBe('absent');
    expect(await whyOf(coder2, ids[0])).toBe('absent');
    expect(await whyOf(curator, ids[0])).toBe('conflict');
    const late = await decide(coder, ids[0], { decision: 'included' });
    expect(late.status).toBe(409);
    expect(late.body.error.message).not.toMatch(/included|excluded|coder2/);
    expect((await coder.get('/api/screening/conflicts')).status).toBe(403);
    const list = screeningConflictsSchema.parse((await curator.get('/api/screening/conflicts?stage=title_abstract')).body);
    expect(list.total).toBe(1);
    expect(list.items[0].id).toBe(ids[0]);
    expect(list.items[0].votes.map((v) => [v.screener?.login, v.decision, v.reason])).toEqual([
      ['coder1', 'excluded', 'wrong_population'],
      ['coder2', 'included', null],
    ]);
    expect(screeningAgreementSchema.parse((await coder.get('/api/screening/agreement')).body).stages.title_abstract.conflicts).toBe(1);
  });

  it('lets a curator settle it with a reason, against the version seen (stale → 409, no rationale → 400), audited, once', async () => {
    const v = await version(ids[0]);
    const noWhy = await curator.post(`/api/screening/conflicts/${ids[0]}/settle`).send({ stage: 'title_abstract', decision: 'excluded', version: v });
    expect(noWhy.status).toBe(400);
    expect(noWhy.body.error.details[0].message).toMatch(/say why/);
    const stale = await curator.post(`/api/screening/conflicts/${ids[0]}/settle`).send({ stage: 'title_abstract', decision: 'included', rationale: 'Adults only.', version: v + 5 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed since you opened it/);
    const ok = await curator
      .post(`/api/screening/conflicts/${ids[0]}/settle`)
      .send({ stage: 'title_abstract', decision: 'excluded', reason: 'wrong_population', rationale: 'The sample is clinical, outside the question.', version: v });
    expect(ok.status).toBe(200);
    expect(screeningResultSchema.parse(ok.body)).toMatchObject({ screeningStatus: 'excluded', version: v + 1, dual: { decisionsIn: 2, settled: true } });
    const detail = (await coder.get(`/api/references/${ids[0]}`)).body;
    expect(detail.reference.screeningStatus).toBe('excluded');
    expect(detail.screening[0]).toMatchObject({ decision: 'excluded', reason: 'wrong_population', decidedBy: { login: 'curator' } });
    expect(detail.screening[0].note).toMatch(/clinical/);
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.settle', entity_id: ids[0] });
    expect(audit).toHaveLength(1);
    expect(audit[0].details.votes).toHaveLength(2);
    const twice = await curator.post(`/api/screening/conflicts/${ids[0]}/settle`).send({ stage: 'title_abstract', decision: 'included', rationale: 'again', version: v + 1 });
    expect(twice.status).toBe(409);
    expect(twice.body.error.message).toMatch(/no disagreement to settle/);
  });

  it('does not let a curator who screened the record settle it (403) nor see it in their list; another curator (admin) may', async () => {
    await decide(curator, ids[2], { decision: 'included' });
    await decide(coder, ids[2], { decision: 'excluded' });
    const list = screeningConflictsSchema.parse((await curator.get('/api/screening/conflicts')).body);
    expect(list.items.map((i) => i.id)).not.toContain(ids[2]);
    expect(list.ownVotes).toBe(1);
    expect(await whyOf(curator, ids[2])).toBe('absent');
    const own = await curator.post(`/api/screening/conflicts/${ids[2]}/settle`).send({ stage: 'title_abstract', decision: 'included', rationale: 'Mine.', version: await version(ids[2]) });
    expect(own.status).toBe(403);
    expect(own.body.error.message).toMatch(/screened reference .* yourself/);
    expect(await whyOf(admin, ids[2])).toBe('conflict');
    const byAdmin = await admin.post(`/api/screening/conflicts/${ids[2]}/settle`).send({ stage: 'title_abstract', decision: 'included', rationale: 'Reports timing in adults.', version: await version(ids[2]) });
    expect(byAdmin.status).toBe(200);
    expect(byAdmin.body.screeningStatus).toBe('awaiting_full_text');
  });

  it('counts agreement per stage over settled pairs: % agreement and Cohen’s κ', async () => {
    const counts = screeningAgreementSchema.parse((await coder.get('/api/screening/agreement')).body);
    // settled pairs at title/abstract: [included, included], [excluded:wrong_population, included], [included, excluded]
    const pairs: [string, string][] = [['included', 'included'], ['excluded:wrong_population', 'included'], ['included', 'excluded']];
    const k = cohensKappaFromPairs(pairs);
    expect(counts.stages.title_abstract).toMatchObject({ pairs: 3, agreed: 1 });
    expect(counts.stages.title_abstract.percentAgreement).toBeCloseTo(1 / 3, 12);
    expect(counts.stages.title_abstract.kappa).toBeCloseTo(k.kappa!, 12);
    expect(counts.stages.title_abstract.caution).toMatch(/only 3 pairs/);
    expect(counts.stages.title_abstract.conflicts).toBe(0);
    expect(counts.screeners).toBe(2);
    expect(counts.stages.full_text).toMatchObject({ pairs: 0, kappa: null });
  });

  it('lets a screener take back their own blind decision (the record waits as new again); a batch of first decisions settles nothing', async () => {
    await decide(coder, ids[3], { decision: 'included' });
    expect(await whyOf(coder2, ids[3])).toBe('second_screener_needed');
    const undo = await coder.post(`/api/references/${ids[3]}/screening/undo`).send({ version: await version(ids[3]) });
    expect(undo.status).toBe(200);
    expect(undo.body).toMatchObject({ screeningStatus: 'unscreened', undone: { decision: 'included' } });
    expect(await whyOf(coder2, ids[3])).toBe('new');
    expect(await whyOf(coder, ids[3])).toBe('new');
    const items = [ids[4], ids[5]];
    const batch = await coder.post('/api/screening/decisions').send({ items: await Promise.all(items.map(async (refId) => ({ refId, version: await version(refId) }))), decision: 'included' });
    expect(batch.status).toBe(201);
    expect(screeningBatchResultSchema.parse(batch.body).results.every((r) => r.dual?.decisionsIn === 1 && !r.dual.settled)).toBe(true);
  });

  it('undoing a decision two screeners settled is a curator’s call and reopens the record for two fresh decisions', async () => {
    const refused = await coder2.post(`/api/references/${ids[1]}/screening/undo`).send({ version: await version(ids[1]) });
    expect(refused.status).toBe(403);
    expect(refused.body.error.message).toMatch(/settled by two screeners/);
    const ok = await curator.post(`/api/references/${ids[1]}/screening/undo`).send({ version: await version(ids[1]) });
    expect(ok.status).toBe(200);
    expect(ok.body.screeningStatus).toBe('unscreened');
    expect(await whyOf(coder, ids[1])).toBe('new');
    expect((await decide(coder, ids[1], { decision: 'included' })).body.dual).toEqual({ decisionsIn: 1, settled: false });
  });

  it('back under one screener, a decision settles at once as before and replaces open blind decisions', async () => {
    expect((await curator.put('/api/screening/rule').send({ screeners: 1 })).status).toBe(200);
    const res = await decide(coder2, ids[4], { decision: 'excluded', reason: 'review_article' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ screeningStatus: 'excluded', dual: null });
    const open = await t.ctx.db('screening_votes').where({ ref_id: ids[4] }).whereNull('withdrawn_at');
    expect(open).toHaveLength(0);
  });
});
