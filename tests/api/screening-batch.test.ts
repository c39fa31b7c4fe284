import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Agent, type TestApp } from '../support/test-app.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';

type Item = { id: number; version: number; keywords: string[]; why: { kind: string; batch: number | null } };

describe('screening several references at once, and what the queue says of each', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  const ids: number[] = [];
  let batchId = 0;
  beforeAll(async () => {
    ({ t, coder, coder2 } = await screeningTeam());
    const text = Array.from({ length: 6 }, (_, i) =>
      bib(`b${i}`, { title: `Batch study ${i} of filled intervals`, author: `Batcher${i}, B`, year: String(2010 + i), doi: `10.5555/batch.${i}`, keywords: 'numerosity; duration, numerosity' }),
    ).join('\n');
    ids.push(...(await importBibtex(coder, text)));
    batchId = (await t.ctx.db('import_entries').where({ reference_id: ids[0] }).first()).batch_id;
  });
  afterAll(async () => {
    await t.close();
  });

  const queue = async () => (await coder.get('/api/screening/queue?limit=10')).body as { items: Item[]; remaining: number };

  it('the queue names why each reference is there (new in its batch) and carries its keywords and attachments', async () => {
    const q = await queue();
    expect(q.items.map((i) => i.id)).toEqual(ids);
    expect(q.items[0]).toMatchObject({ why: { kind: 'new', batch: batchId }, keywords: ['numerosity', 'duration'], attachments: [] });
  });

  it('decides five at once in one transaction, each a decision in the history and the audit', async () => {
    const items = ids.slice(0, 5).map((refId) => ({ refId, version: 1 }));
    const res = await coder.post('/api/screening/decisions').send({ items, decision: 'excluded', reason: 'review_article', note: 'narrative' });
    expect(res.status).toBe(201);
    expect(res.body.results.map((r: { refId: number; version: number; screeningStatus: string }) => [r.refId, r.version, r.screeningStatus])).toEqual(
      ids.slice(0, 5).map((id) => [id, 2, 'excluded']),
    );
    expect((await queue()).remaining).toBe(1);
    const audits = await t.ctx.db('audit_log').where({ action: 'screening.decide' }).whereIn('entity_id', ids).count({ n: '*' }).first();
    expect(Number(audits?.n)).toBe(5);
    const counts = await coder.get('/api/screening/counts');
    expect(counts.body.excluded.byReason.review_article).toBe(5);
  });

  it('refuses the whole batch when one reference changed meanwhile, naming it', async () => {
    const before = await t.ctx.db('screening_decisions').count({ n: '*' }).first();
    const res = await coder2.post('/api/screening/decisions').send({ items: [{ refId: ids[5], version: 1 }, { refId: ids[0], version: 1 }], decision: 'included' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(new RegExp(`Reference ${ids[0]} changed since you opened it`));
    expect(await t.ctx.db('screening_decisions').count({ n: '*' }).first()).toEqual(before);
    expect((await t.ctx.db('refs').where({ id: ids[5] }).first()).screening_status).toBe('unscreened');
  });

  it('checks the batch: a reason of the stage, each reference once, at most 100', async () => {
    const wrongStage = await coder.post('/api/screening/decisions').send({ items: [{ refId: ids[5], version: 1 }], decision: 'excluded', reason: 'full_text_unavailable' });
    expect(wrongStage.status).toBe(422);
    expect(wrongStage.body.error.message).toMatch(/^“Full text not available” is not a reason at the title and abstract stage/);
    expect((await t.ctx.db('refs').where({ id: ids[5] }).first()).screening_status).toBe('unscreened');
    const twice = await coder.post('/api/screening/decisions').send({ items: [{ refId: ids[5], version: 1 }, { refId: ids[5], version: 1 }], decision: 'included' });
    expect(twice.body.error.details[0].message).toBe('each reference once');
    const empty = await coder.post('/api/screening/decisions').send({ items: [], decision: 'included' });
    expect(empty.body.error.details[0].message).toBe('choose at least one reference');
    const many = Array.from({ length: 101 }, (_, i) => ({ refId: i + 1, version: 1 }));
    expect((await coder.post('/api/screening/decisions').send({ items: many, decision: 'included' })).body.error.details[0].message).toBe('decide at most 100 references at once');
  });

  it('takes the batch back as one: all return to the queue; another contributor may not', async () => {
    const items = ids.slice(0, 5).map((refId) => ({ refId, version: 2 }));
    const other = await coder2.post('/api/screening/decisions/undo').send({ items });
    expect(other.status).toBe(403);
    expect((await queue()).remaining).toBe(1);
    const res = await coder.post('/api/screening/decisions/undo').send({ items });
    expect(res.status).toBe(200);
    expect(res.body.results.map((r: { refId: number; screeningStatus: string; version: number }) => [r.refId, r.screeningStatus, r.version])).toEqual(
      ids.slice(0, 5).map((id) => [id, 'unscreened', 3]),
    );
    expect((await queue()).remaining).toBe(6);
    const counts = await coder.get('/api/screening/counts');
    expect(counts.body.excluded.total).toBe(0);
  });
});
