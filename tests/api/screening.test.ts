import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { type Agent, type TestApp } from '../support/test-app.js';
import { importBibtex, screeningTeam } from '../support/screening-team.js';
import { bib } from '../support/references.js';

describe('screening', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  let curator: Agent;
  const ids: number[] = [];
  beforeAll(async () => {
    ({ t, coder, coder2, curator } = await screeningTeam());
    const text = Array.from({ length: 6 }, (_, i) => bib(`s${i}`, { title: `Screening study number ${i} on interval timing`, author: `Person${i}, A`, year: String(2000 + i), doi: `10.5555/screen.${i}` })).join('\n');
    ids.push(...(await importBibtex(coder, text)));
  });
  afterAll(async () => {
    await t.close();
  });

  it('checks decisions: a reason of the stage, "other" needs a note, an inclusion takes no reason', async () => {
    const fullTextReason = await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'excluded', version: 1, reason: 'no_usable_statistics' });
    expect(fullTextReason.status).toBe(422);
    expect(fullTextReason.body.error.message).toMatch(/^“No usable statistics” is not a reason at the title and abstract stage of reference \d+; pick one of “Not about time perception”/);
    const other = await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'excluded', version: 1, reason: 'other' });
    expect(other.body.error.details[0].path).toBe('body.note');
    const inclReason = await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'included', version: 1, reason: 'review_article' });
    expect(inclReason.status).toBe(400);
    const unknown = await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'maybe', version: 1 });
    expect(unknown.status).toBe(400);
  });

  it('the queue serves unscreened references oldest first and shrinks as decisions land', async () => {
    const q = await coder.get('/api/screening/queue?limit=3');
    expect(q.status).toBe(200);
    expect(q.body.remaining).toBe(6);
    expect(q.body.items.map((r: { id: number }) => r.id)).toEqual(ids.slice(0, 3));
    await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'included', version: 1 });
    const q2 = await coder.get('/api/screening/queue?limit=3');
    expect(q2.body.remaining).toBe(5);
    expect(q2.body.items[0].id).toBe(ids[1]);
  });

  it('PRISMA counts equal what the data says after a scripted sequence of decisions at both stages (history kept)', async () => {
    const ok = (r: { status: number }) => expect(r.status).toBe(201);
    ok(await coder.post(`/api/references/${ids[0]}/screening`).send({ decision: 'included', version: 2 }));
    ok(await coder.post(`/api/references/${ids[1]}/screening`).send({ decision: 'excluded', version: 1, reason: 'wrong_population' }));
    ok(await coder2.post(`/api/references/${ids[2]}/screening`).send({ decision: 'included', version: 1 }));
    ok(await coder2.post(`/api/references/${ids[2]}/screening`).send({ decision: 'excluded', version: 2, reason: 'no_usable_statistics' }));
    await coder.post(`/api/references/${ids[3]}/screening`).send({ decision: 'excluded', version: 1, reason: 'other', note: 'animal study' });
    // ids[3] is reconsidered: the latest decision counts, the history keeps both.
    await coder2.post(`/api/references/${ids[3]}/screening`).send({ decision: 'included', version: 2, note: 'human sample after all' });
    await coder.post(`/api/references/${ids[4]}/screening`).send({ decision: 'excluded', version: 1, reason: 'wrong_population' });
    // A re-imported file adds duplicate entries to "identified" and to "duplicates removed".
    await coder.post('/api/imports').send({ format: 'bibtex', text: bib('again', { title: 'Screening study number 0 on interval timing', author: 'Person0, A', year: '2000', doi: '10.5555/screen.0' }) });

    const res = await coder.get('/api/screening/counts');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      stages: {
        title_abstract: {
          decided: 5, waiting: 1, included: 3, excluded: 2,
          excludedByReason: { not_time_perception: 0, wrong_population: 2, review_article: 0, duplicate_publication: 0, other: 0 },
        },
        full_text: {
          decided: 2, waiting: 1, included: 1, excluded: 1,
          excludedByReason: { no_usable_statistics: 1, wrong_population: 0, not_time_perception: 0, review_article: 0, duplicate_publication: 0, full_text_unavailable: 0, other: 0 },
        },
      },
      identified: { total: 7, bySource: { bibtex: 7 } },
      duplicatesRemoved: { total: 1, importDuplicates: 1, merged: 0 },
      afterDuplicates: 6,
      screened: 4,
      awaitingScreening: 2,
      excluded: { total: 3, byReason: { wrong_population: 2, not_time_perception: 0, no_usable_statistics: 1, review_article: 0, duplicate_publication: 0, full_text_unavailable: 0, other: 0 } },
      included: 1,
    });
    // Cross-check with the tables themselves.
    const st = await t.ctx.db('refs').whereNull('merged_into').groupBy('screening_status').select('screening_status').count({ n: '*' });
    expect(Object.fromEntries(st.map((r: any) => [r.screening_status, r.n]))).toEqual({ included: 1, excluded: 3, awaiting_full_text: 1, unscreened: 1 });
    const history = await coder.get(`/api/references/${ids[3]}`);
    expect(history.body.screening.map((s: { decision: string; stage: string }) => [s.decision, s.stage])).toEqual([['included', 'title_abstract'], ['excluded', 'title_abstract']]);
    expect(history.body.screening[0].decidedBy.login).toBe('coder2');

    // A curator merge of two live references moves one into "duplicates removed".
    const merge = await curator.post('/api/references/merge').send({ a: ids[4], b: ids[5] });
    expect(merge.status).toBe(200);
    const after = await coder.get('/api/screening/counts');
    expect(after.body.duplicatesRemoved).toEqual({ total: 2, importDuplicates: 1, merged: 1 });
    expect(after.body.afterDuplicates).toBe(5);
    expect(after.body.identified.total).toBe(7);
    expect(after.body.screened + after.body.awaitingScreening).toBe(after.body.afterDuplicates);
  });

  it('writes every decision to the audit log', async () => {
    const n = await t.ctx.db('audit_log').where({ action: 'screening.decide' }).count({ n: '*' }).first();
    expect(n?.n).toBe(8);
  });
});
