import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as migration from '../../migrations/20261206500000_add_screening_stages.js';
import { type Agent, type TestApp } from '../support/test-app.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';

describe('screening in two stages: title and abstract, then full text (PRISMA 2020 items 8 and 16)', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  const ids: number[] = [];
  const version = async (id: number) => (await coder.get(`/api/references/${id}`)).body.reference.version as number;
  const decide = async (who: Agent, id: number, body: Record<string, unknown>) => who.post(`/api/references/${id}/screening`).send({ ...body, version: await version(id) });
  const queue = async (stage: string) => (await coder.get(`/api/screening/queue?stage=${stage}&limit=50`)).body;
  const status = async (id: number) => (await coder.get(`/api/references/${id}`)).body.reference.screeningStatus as string;

  beforeAll(async () => {
    ({ t, coder, coder2 } = await screeningTeam());
    const text = Array.from({ length: 5 }, (_, i) => bib(`st${i}`, { title: `Two-stage screening study ${i} of interval timing`, author: `Stage${i}, B`, year: String(2010 + i), doi: `10.5555/stage.${i}` })).join('\n');
    ids.push(...(await importBibtex(coder, text)));
  });
  afterAll(async () => {
    await t.close();
  });

  it('an inclusion on title and abstract moves a reference to the full-text queue; coding waits for the full-text inclusion', async () => {
    const first = await decide(coder, ids[0], { decision: 'included' });
    expect(first.status).toBe(201);
    expect(first.body).toMatchObject({ stage: 'title_abstract', screeningStatus: 'awaiting_full_text' });
    expect((await queue('title_abstract')).items.map((i: { id: number }) => i.id)).not.toContain(ids[0]);
    const full = await queue('full_text');
    expect(full).toMatchObject({ stage: 'full_text', remaining: 1 });
    expect(full.items[0]).toMatchObject({ id: ids[0], why: { kind: 'passed_title_abstract' } });

    const early = await coder2.post('/api/extractions').send({ referenceId: ids[0] });
    expect(early.status).toBe(422);
    expect(early.body.error.message).toBe('This reference passed title and abstract screening; it is coded once its full text is included.');
    expect((await coder2.get('/api/extractions/claimable')).body.items.map((i: { id: number }) => i.id)).not.toContain(ids[0]);

    const included = await decide(coder, ids[0], { decision: 'included' });
    expect(included.body).toMatchObject({ stage: 'full_text', screeningStatus: 'included' });
    expect((await queue('full_text')).remaining).toBe(0);
    const claimed = await coder2.post('/api/extractions').send({ referenceId: ids[0] });
    expect(claimed.status).toBe(201);
  });

  it('a full-text exclusion needs a reason of its stage (422 in words); at title and abstract a reason is optional', async () => {
    await decide(coder, ids[1], { decision: 'included' });
    const none = await decide(coder, ids[1], { decision: 'excluded' });
    expect(none.status).toBe(422);
    expect(none.body.error.message).toBe(
      `Reference ${ids[1]} is at the full-text stage, where an exclusion needs a reason: pick one of “No usable statistics”, “Wrong population”, “Not about time perception”, “Review article”, “Duplicate publication”, “Full text not available”, “Other (explained)”.`,
    );
    expect(await status(ids[1])).toBe('awaiting_full_text');
    const ok = await decide(coder, ids[1], { decision: 'excluded', reason: 'full_text_unavailable' });
    expect(ok.status).toBe(201);
    expect(ok.body).toMatchObject({ stage: 'full_text', screeningStatus: 'excluded', reason: 'full_text_unavailable' });

    const quick = await decide(coder2, ids[2], { decision: 'excluded' });
    expect(quick.status).toBe(201);
    expect(quick.body).toMatchObject({ stage: 'title_abstract', screeningStatus: 'excluded', reason: null });
  });

  it('a decision sent for the other stage answers 409 and changes nothing', async () => {
    const res = await decide(coder, ids[3], { decision: 'included', stage: 'full_text' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(new RegExp(`^Reference ${ids[3]} is at the title and abstract stage now, not full-text`));
    expect(res.body.error.details).toMatchObject({ stage: 'title_abstract', screeningStatus: 'unscreened' });
    expect(await status(ids[3])).toBe('unscreened');
    const bad = await coder.get('/api/screening/queue?stage=abstract');
    expect(bad.status).toBe(400);
  });

  it('counts each stage on its own and over both; undoing a full-text decision sends the reference back to the full-text queue', async () => {
    await decide(coder, ids[3], { decision: 'included' });
    const c = (await coder.get('/api/screening/counts')).body;
    // ids: 0 included, 1 excluded at full text, 2 excluded at title/abstract (no reason), 3 awaiting full text, 4 unscreened
    expect(c.stages.title_abstract).toMatchObject({ decided: 4, waiting: 1, included: 3, excluded: 1 });
    expect(c.stages.title_abstract.excludedByReason).toMatchObject({ no_reason_given: 1, wrong_population: 0 });
    expect(c.stages.full_text).toMatchObject({ decided: 2, waiting: 1, included: 1, excluded: 1 });
    expect(c.stages.full_text.excludedByReason.full_text_unavailable).toBe(1);
    expect(c).toMatchObject({ screened: 3, awaitingScreening: 2, included: 1, excluded: { total: 2 } });

    const undo = await coder.post(`/api/references/${ids[1]}/screening/undo`).send({ version: await version(ids[1]) });
    expect(undo.status).toBe(200);
    expect(undo.body).toMatchObject({ undone: { stage: 'full_text', decision: 'excluded' }, screeningStatus: 'awaiting_full_text' });
    expect((await queue('full_text')).items.map((i: { id: number }) => i.id)).toEqual([ids[1], ids[3]]);
    const history = (await coder.get(`/api/references/${ids[1]}`)).body.screening;
    expect(history.map((h: { stage: string; decision: string }) => `${h.stage}:${h.decision}`)).toEqual(['title_abstract:included']);
  });

  it('the migration keeps every one-stage decision: each becomes a full-text decision after a carried-over title/abstract inclusion; down() goes back', async () => {
    const db = t.ctx.db;
    await migration.down(db);
    expect(await db.schema.hasColumn('screening_decisions', 'stage')).toBe(false);
    // Down: the reference awaiting its full text is unscreened again, its title/abstract inclusion kept but undone.
    expect(await db('refs').whereIn('id', [ids[1], ids[3]]).pluck('screening_status')).toEqual(['unscreened', 'unscreened']);
    expect(await db('screening_decisions').where({ ref_id: ids[3] }).whereNull('undone_at').count({ n: '*' }).first()).toEqual({ n: 0 });
    expect(await db('screening_decisions').where({ ref_id: ids[2] }).first()).toMatchObject({ decision: 'excluded', reason: 'other' });
    // One-stage decisions made before the migration.
    const [u] = await db('users').where({ login: 'coder1' }).pluck('id');
    await db('screening_decisions').insert({ ref_id: ids[4], decision: 'included', decided_by: u, decided_at: new Date('2026-11-01T10:00:00Z') });
    await db('refs').where({ id: ids[4] }).update({ screening_status: 'included' });

    await migration.up(db);
    const rows = await db('screening_decisions').where({ ref_id: ids[4] }).orderBy('decided_at');
    expect(rows.map((r) => [r.stage, r.decision, r.carried_over])).toEqual([['title_abstract', 'included', true], ['full_text', 'included', false]]);
    expect(await status(ids[4])).toBe('included');
    expect(await status(ids[0])).toBe('included');
    const c = (await coder.get('/api/screening/counts')).body;
    expect(c.stages.title_abstract.decided + c.stages.title_abstract.waiting).toBe(c.afterDuplicates);
    expect(c.stages.full_text.decided + c.stages.full_text.waiting).toBe(c.stages.title_abstract.included);
    // Undoing the carried decision's full-text inclusion leaves it awaiting its full text.
    const undo = await coder.post(`/api/references/${ids[4]}/screening/undo`).send({ version: await version(ids[4]) });
    expect(undo.body.screeningStatus).toBe('awaiting_full_text');
  });
});
