import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { z } from 'zod';
import { seed as seedReferences } from '../../seeds/02_demo_references.js';
import { seed as seedRegistry } from '../../seeds/03_demo_registry.js';
import { auditPageSchema, healthSchema, mailLogPageSchema } from '../../shared/schemas/admin.js';
import { apiErrorSchema } from '../../shared/schemas/common.js';
import { claimablePageSchema, extractionDetailSchema, myExtractionPageSchema } from '../../shared/schemas/extraction.js';
import {
  agreementForReferenceSchema, assignmentPageSchema, candidatePageSchema, coderListSchema, overallAgreementSchema, pairDetailSchema,
  reconciledPairSchema, reconciliationQueueSchema, recordHistorySchema, referenceAgreementPageSchema,
} from '../../shared/schemas/reconciliation.js';
import {
  duplicatePageSchema, importPageSchema, importResultSchema, prismaCountsSchema, referenceDetailSchema, referencePageSchema, screeningBatchResultSchema, screeningBatchUndoResultSchema,
  screeningQueueSchema,
  searchResultSchema,
} from '../../shared/schemas/references.js';
import { screeningAgreementSchema, screeningConflictsSchema, screeningRuleSchema } from '../../shared/schemas/screening.js';
import { followChangesSchema, followListSchema, followSchema, snapshotDiffSchema, unsubscribeAnswerSchema } from '../../shared/schemas/following.js';
import { manipulationPageSchema, settledEffectDetailSchema, settledEffectPageSchema } from '../../shared/schemas/registry.js';
import {
  atlasLandingSchema, atlasManipulationSchema, atlasOutcomeSchema, atlasPooledSchema, atlasReferencePageSchema, createdSnapshotSchema, snapshotCitationSchema, snapshotPageSchema,
  snapshotViewSchema, synthesisAnswerSchema, synthesisFacetsSchema, synthesisFlowAnswerSchema, synthesisFlowSchema,
} from '../../shared/schemas/synthesis.js';
import { adminUserPageSchema, apiTokenListSchema, createdTokenSchema, meSchema } from '../../shared/schemas/users.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';

/** The answer has the shape its shared schema declares (the same schema types the service and the client). */
function expectShape(schema: z.ZodType, res: { status: number; body: unknown }, status = 200) {
  expect(res.status).toBe(status);
  const parsed = schema.safeParse(res.body);
  expect(parsed.success ? [] : parsed.error.issues.slice(0, 5)).toEqual([]);
}

describe('every JSON answer has the shape declared once in shared/schemas', () => {
  let t: TestApp;
  const as: Record<string, Agent> = {};
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    await seedReferences(t.ctx.db);
    await seedRegistry(t.ctx.db);
    for (const login of ['admin', 'curator', 'coder1', 'reviewer']) as[login] = await signIn(t.app, login);
  }, 120_000);
  afterAll(() => t.close());

  it('people, tokens, audit, mail log and health', async () => {
    expectShape(meSchema, await as.reviewer.get('/api/me'));
    expectShape(adminUserPageSchema, await as.admin.get('/api/admin/users'));
    expectShape(auditPageSchema, await as.admin.get('/api/admin/audit'));
    expectShape(createdTokenSchema, await as.reviewer.post('/api/tokens').send({ name: 'shapes' }), 201);
    expectShape(apiTokenListSchema, await as.reviewer.get('/api/tokens'));
    expectShape(mailLogPageSchema, await as.admin.get('/api/mail/log'));
    const health = await anonymous(t.app).get('/api/health');
    expectShape(healthSchema, health, health.status);
  });

  it('references, screening, duplicates, imports and search', async () => {
    const list = await as.curator.get('/api/references?pageSize=5');
    expectShape(referencePageSchema, list);
    expectShape(referenceDetailSchema, await as.curator.get(`/api/references/${list.body.items[0].id}`));
    const queue = await as.coder1.get('/api/screening/queue');
    expectShape(screeningQueueSchema, queue);
    const items = [{ refId: queue.body.items[0].id, version: queue.body.items[0].version }];
    expectShape(screeningBatchResultSchema, await as.coder1.post('/api/screening/decisions').send({ items, decision: 'included' }), 201);
    expectShape(screeningBatchUndoResultSchema, await as.coder1.post('/api/screening/decisions/undo').send({ items: [{ ...items[0], version: items[0].version + 1 }] }));
    expectShape(prismaCountsSchema, await anonymous(t.app).get('/api/screening/counts'));
    expectShape(screeningRuleSchema, await as.coder1.get('/api/screening/rule'));
    expectShape(screeningAgreementSchema, await anonymous(t.app).get('/api/screening/agreement'));
    expectShape(screeningConflictsSchema, await as.curator.get('/api/screening/conflicts'));
    expectShape(duplicatePageSchema, await as.curator.get('/api/duplicates'));
    const imports = await as.coder1.get('/api/imports');
    expectShape(importPageSchema, imports);
    expectShape(importResultSchema, await as.coder1.get(`/api/imports/${imports.body.items[0].id}`));
    expectShape(searchResultSchema, await anonymous(t.app).get('/api/search?q=duration'));
  });

  it('settled effects, the vocabulary and the atlas', async () => {
    const effects = await anonymous(t.app).get('/api/effects?pageSize=3');
    expectShape(settledEffectPageSchema, effects);
    expectShape(settledEffectDetailSchema, await anonymous(t.app).get(`/api/effects/${effects.body.items[0].id}`));
    expectShape(manipulationPageSchema, await anonymous(t.app).get('/api/manipulations?includeRetired=true'));
    expectShape(atlasLandingSchema, await anonymous(t.app).get('/api/atlas'));
    expectShape(atlasManipulationSchema, await anonymous(t.app).get('/api/atlas/manipulations/luminance'));
    expectShape(atlasPooledSchema, await anonymous(t.app).get('/api/atlas/manipulations/luminance/pooled'));
    expectShape(atlasReferencePageSchema, await anonymous(t.app).get('/api/atlas/manipulations/luminance/references'));
    expectShape(atlasOutcomeSchema, await anonymous(t.app).get('/api/atlas/outcomes/duration_distortion'));
  });

  it('coding sheets, assignments, reconciliation, records and agreement', async () => {
    const mine = await as.coder1.get('/api/extractions');
    expectShape(myExtractionPageSchema, mine);
    expectShape(extractionDetailSchema, await as.coder1.get(`/api/extractions/${mine.body.items[0].id}`));
    expectShape(claimablePageSchema, await as.coder1.get('/api/extractions/claimable'));
    expectShape(assignmentPageSchema, await as.curator.get('/api/assignments?state=settled'));
    expectShape(candidatePageSchema, await as.curator.get('/api/assignments/candidates?status=any'));
    expectShape(coderListSchema, await as.curator.get('/api/assignments/coders'));
    const queue = await as.curator.get('/api/reconciliation');
    expectShape(reconciliationQueueSchema, queue);
    expect(queue.body.items.length).toBeGreaterThan(0);
    const pair = await as.curator.get(`/api/reconciliation/${queue.body.items[0].assignmentId}`);
    expectShape(pairDetailSchema, pair);
    const decisions = pair.body.discrepancies.map((d: { id: number }) => ({ discrepancyId: d.id, resolution: 'a' }));
    const reconciled = await as.curator.post(`/api/reconciliation/${pair.body.assignment.id}/reconcile`).send({ version: pair.body.assignment.version, rationale: 'Coder A matches Table 1.', decisions });
    expectShape(reconciledPairSchema, reconciled);
    const effect = (await anonymous(t.app).get('/api/effects?pageSize=1')).body.items[0];
    expectShape(recordHistorySchema, await anonymous(t.app).get(`/api/records?referenceId=${effect.referenceId}`));
    expectShape(extractionDetailSchema, await anonymous(t.app).get(`/api/records/${effect.recordId}`));
    expectShape(overallAgreementSchema, await as.curator.get('/api/agreement'));
    const byRef = await as.curator.get('/api/agreement/references');
    expectShape(referenceAgreementPageSchema, byRef);
    expectShape(agreementForReferenceSchema, await as.curator.get(`/api/agreement/references/${byRef.body.items[0].referenceId}`));
  });

  it('syntheses, snapshots and the error envelope', async () => {
    expectShape(synthesisFacetsSchema, await anonymous(t.app).get('/api/syntheses/facets'));
    const request = { filters: { manipulation: 'luminance' }, smdFamily: 'raw_score' };
    expectShape(synthesisAnswerSchema, await anonymous(t.app).post('/api/syntheses').send(request));
    expectShape(synthesisAnswerSchema, await anonymous(t.app).post('/api/syntheses?rows=page&pageSize=3&sort=weight').send(request));
    expectShape(synthesisAnswerSchema, await anonymous(t.app).post('/api/syntheses?rows=none').send(request));
    expectShape(synthesisAnswerSchema, await anonymous(t.app).post('/api/syntheses?rows=page&page=2&pageSize=2&sort=se&order=desc').send(request));
    const created = await as.reviewer.post('/api/snapshots').send(request);
    expectShape(createdSnapshotSchema, created, 201);
    expectShape(snapshotPageSchema, await anonymous(t.app).get('/api/snapshots'));
    expectShape(snapshotViewSchema, await anonymous(t.app).get(`/api/snapshots/${created.body.id}`));
    expectShape(snapshotCitationSchema, await anonymous(t.app).get(`/api/snapshots/${created.body.id}/citation`));
    expectShape(synthesisFlowAnswerSchema, await anonymous(t.app).post('/api/syntheses/flow').send(request));
    expect(synthesisFlowSchema.safeParse((await anonymous(t.app).get(`/api/snapshots/${created.body.id}`)).body.flow).success).toBe(true);
    const follow = await as.reviewer.post('/api/follows').send({ request });
    expectShape(followSchema, follow, 201);
    expectShape(followListSchema, await as.reviewer.get('/api/follows'));
    expectShape(followChangesSchema, await as.reviewer.get(`/api/follows/${follow.body.id}/changes`));
    expectShape(followSchema, await as.reviewer.post('/api/follows').send({ snapshotId: created.body.id }), 201);
    expectShape(snapshotDiffSchema, await anonymous(t.app).get(`/api/snapshots/${created.body.id}/diff`));
    expectShape(apiErrorSchema, await anonymous(t.app).get('/api/snapshots/NOT-AN-ID/feed.atom'), 400);
    const { unsubscribe_token: token } = await t.ctx.db('follows').where({ id: follow.body.id }).first('unsubscribe_token');
    expectShape(unsubscribeAnswerSchema, await anonymous(t.app).get(`/api/follows/unsubscribe?token=${token}`));
    expectShape(apiErrorSchema, await anonymous(t.app).get('/api/follows/abc/feed.atom'), 400);
    expectShape(apiErrorSchema, await anonymous(t.app).get('/api/no-such-route'), 404);
    expectShape(apiErrorSchema, await anonymous(t.app).get('/api/effects?pageSize=0'), 400);
  });
});
