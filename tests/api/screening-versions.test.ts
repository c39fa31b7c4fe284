import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Agent, type TestApp } from '../support/test-app.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';
import { settleInventedReference } from './syntheses-fixtures.js';

describe('screening decisions carry a version; excluding settled effects is a curator’s call', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  let curator: Agent;
  let refId: number;
  beforeAll(async () => {
    ({ t, coder, coder2, curator } = await screeningTeam());
    [refId] = await importBibtex(coder, bib('v1', { title: 'Two tabs on one interval timing study', author: 'Tabs, A', year: '2011', doi: '10.5555/screen.tabs' }));
  });
  afterAll(async () => {
    await t.close();
  });

  it('a decision made on an old version answers 409 and names the decision that won', async () => {
    const seen = (await coder.get(`/api/references/${refId}`)).body.reference.version;
    const first = await coder.post(`/api/references/${refId}/screening`).send({ decision: 'included', version: seen });
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ stage: 'title_abstract', screeningStatus: 'awaiting_full_text', version: seen + 1, withdrawnRecords: [], registryVersion: null });
    const stale = await coder2.post(`/api/references/${refId}/screening`).send({ decision: 'excluded', reason: 'wrong_population', version: seen });
    expect(stale.status).toBe(409);
    expect(stale.body.error.message).toMatch(/changed since you opened it .*now included at title and abstract by coder1/);
    expect(stale.body.error.details).toEqual({ currentVersion: seen + 1, screeningStatus: 'awaiting_full_text' });
    const after = await coder.get(`/api/references/${refId}`);
    expect(after.body.reference.screeningStatus).toBe('awaiting_full_text');
    expect(after.body.screening).toHaveLength(1);
    // A missing version is a field error.
    const none = await coder2.post(`/api/references/${refId}/screening`).send({ decision: 'included' });
    expect(none.status).toBe(400);
    expect(none.body.error.details[0]).toEqual({ path: 'body.version', message: 'send the reference version you saw' });
    // Reloaded, the second screener may decide.
    const again = await coder2.post(`/api/references/${refId}/screening`).send({ decision: 'excluded', reason: 'wrong_population', version: seen + 1 });
    expect(again.status).toBe(201);
    expect(again.body.version).toBe(seen + 2);
  });

  it('a contributor cannot exclude a reference with settled effects; a curator can, withdrawing them with the reason', async () => {
    const s = await settleInventedReference(t.ctx.db, 'luminance', 2014, [{ mean1: 660, mean2: 600, sd: 80, n: 16, second: { mean1: 650, mean2: 605 } }]);
    const id = s.referenceId;
    const effects = () => coder.get(`/api/effects?referenceId=${id}`);
    const before = await effects();
    expect(before.body.total).toBe(2);
    const version = (await coder.get(`/api/references/${id}`)).body.reference.version;

    const refused = await coder.post(`/api/references/${id}/screening`).send({ decision: 'excluded', reason: 'review_article', version });
    expect(refused.status).toBe(403);
    expect(refused.body.error.message).toMatch(/has settled effects; only a curator may exclude it/);
    expect((await coder.get(`/api/references/${id}`)).body.reference).toMatchObject({ version, screeningStatus: 'included' });
    expect((await effects()).body.total).toBe(2);
    // Including it again takes nothing away.
    const kept = await coder.post(`/api/references/${id}/screening`).send({ decision: 'included', note: 'checked the methods', version });
    expect(kept.status).toBe(201);
    expect(kept.body.withdrawnRecords).toEqual([]);

    const excluded = await curator.post(`/api/references/${id}/screening`).send({ decision: 'excluded', reason: 'review_article', note: 'a narrative review after all', version: version + 1 });
    expect(excluded.status).toBe(201);
    expect(excluded.body.withdrawnRecords).toEqual([s.recordId]);
    expect(excluded.body.registryVersion).toBeGreaterThan(before.body.registryVersion);
    const now = await effects();
    expect(now.body.total).toBe(0);
    expect(now.body.registryVersion).toBe(excluded.body.registryVersion);
    const record = await t.ctx.db('extractions').where({ id: s.recordId }).first();
    expect(record.state).toBe('withdrawn');
    const settlement = await t.ctx.db('settlements').where({ record_id: s.recordId, kind: 'withdrawn' }).first();
    expect(settlement.rationale).toBe('Excluded at full-text screening: Review article (a narrative review after all)');
    const audit = await t.ctx.db('audit_log').where({ action: 'screening.decide', entity_id: String(id) }).orderBy('id', 'desc').first();
    expect(audit.details).toMatchObject({ decision: 'excluded', withdrawnRecords: [s.recordId] });
    // Nothing settled is left, so a contributor's later decisions need no curator.
    const later = await coder.post(`/api/references/${id}/screening`).send({ decision: 'excluded', reason: 'other', note: 'same', version: version + 2 });
    expect(later.status).toBe(201);
  });
});
