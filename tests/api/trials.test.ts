// Trial data on a coding sheet: upload with row errors, the fit job with progress, the derived effect checked
// against statsmodels + numpy (tests/reference/trials_reference.py), the sheet's save, who may see what, and
// the snapshot download.
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSettledRecord } from '../../server/services/settlement.js';
import { toSheet } from '../../shared/extraction/stored-sheet.js';
import { contrastSchema, fitStartedSchema, trialSetDetailSchema, trialSetListSchema, trialSetSchema } from '../../shared/schemas/trials.js';
import type { z } from 'zod';
import { runReference, relErr } from '../reference/python-reference.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { countsCsv, inventTrials, ORDER_SOAS, SJ_SOAS, trialsCsv } from '../support/trials.js';
import { insertReference } from './extraction-fixtures.js';

const ORDER = inventTrials({ task: 'order', participants: 12, conditions: { synchronous: 0, delayed: 40 }, levels: ORDER_SOAS, trialsPerLevel: 20, seed: 1502 });

/** The answer has the shape its shared schema declares. */
function expectShape(schema: z.ZodType, body: unknown) {
  const parsed = schema.safeParse(body);
  expect(parsed.success ? [] : parsed.error.issues.slice(0, 5)).toEqual([]);
}

async function waitForFits(agent: Agent, setId: number, seen: number[] = []) {
  const until = Date.now() + 90_000;
  for (;;) {
    const res = await agent.get(`/api/trial-sets/${setId}`);
    expect(res.status).toBe(200);
    seen.push(res.body.set.fit.done);
    if (res.body.set.fit.state === 'done' || res.body.set.fit.state === 'failed') return res.body;
    if (Date.now() > until) throw new Error(`fits of set ${setId} still ${res.body.set.fit.state} after 90 s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

const upload = (agent: Agent, extraction: number, csv: string, fields: Record<string, string> = {}) =>
  agent
    .post(`/api/extractions/${extraction}/trial-sets`)
    .field('label', fields.label ?? 'Experiment 1, order task')
    .field('task', fields.task ?? 'order')
    .field('modality', fields.modality ?? 'audiovisual')
    .field('model', fields.model ?? 'cumulative_gaussian')
    .attach('file', Buffer.from(csv), { filename: fields.filename ?? 'order.csv', contentType: 'text/csv' });

describe('trial data', () => {
  let t: TestApp;
  let coder: Agent;
  let coder2: Agent;
  let curator: Agent;
  let reviewer: Agent;
  let ref: number;
  let extraction: number;
  let setId: number;
  let detail: any;
  const progress: number[] = [];

  beforeAll(async () => {
    t = await createTestApp({ jobs: true });
    await resetDb(t.ctx.db);
    [coder, coder2, curator, reviewer] = await Promise.all(['coder1', 'coder2', 'curator', 'reviewer'].map((l) => signIn(t.app, l)));
    ref = await insertReference(t.ctx.db, { firstAuthor: 'Quillfeather', year: 2023 });
    const claim = await coder.post('/api/extractions').send({ referenceId: ref });
    expect(claim.status).toBe(201);
    extraction = claim.body.id;
  }, 60_000);
  afterAll(async () => {
    await t.close();
  });

  it('refuses a file with a bad row, names the line in words, and stores nothing', async () => {
    const lines = trialsCsv(ORDER).split('\n');
    lines[4] = 'P01,synchronous,-240,2';
    lines[7] = 'P01,,abc,1';
    const res = await upload(coder, extraction, lines.join('\n'));
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_input');
    expect(res.body.error.message).toMatch(/2 rows have problems; nothing was stored/);
    expect(res.body.error.details).toEqual([
      { path: 'file.line.5', message: 'Line 5: response must be 0 or 1 (got "2")' },
      { path: 'file.line.8', message: 'Line 8: condition is empty; level must be a number of ms (got "abc")' },
    ]);
    expect((await coder.get(`/api/extractions/${extraction}/trial-sets`)).body.items).toEqual([]);
    expect(Number((await t.ctx.db('trial_rows').count({ c: '*' }).first())!.c)).toBe(0);
  });

  it('refuses a header it cannot read, a participant with too few levels, and a file over the size limit', async () => {
    const header = await upload(coder, extraction, 'who,cond,soa,answer\nP1,a,0,1\n');
    expect(header.status).toBe(400);
    expect(header.body.error.details[0].message).toMatch(/^Line 1: the first line must name the columns participant, condition, level and response/);
    const few = await upload(coder, extraction, 'participant,condition,level,n,k\nP1,a,0,10,5\nP1,a,50,10,7\nP2,a,0,10,4\n');
    expect(few.status).toBe(400);
    expect(few.body.error.details).toEqual([{ path: 'file.line.4', message: 'Line 4: participant P2 in condition a has 1 level; a psychometric function needs at least 2' }]);
    const big = await upload(coder, extraction, 'participant,condition,level,response\n' + 'P01,a,0,1\n'.repeat(600_000));
    expect(big.status).toBe(400);
    expect(big.body.error.message).toMatch(/larger than 5 MB/);
    const missing = await coder.post(`/api/extractions/${extraction}/trial-sets`).field('label', 'x').field('task', 'order').field('modality', 'visual');
    expect(missing.status).toBe(400);
    const badMeta = await upload(coder, extraction, trialsCsv(ORDER), { task: 'guessing' });
    expect(badMeta.status).toBe(400);
    expect(badMeta.body.error.details[0].path).toBe('body.task');
  });

  it('stores a good file with one bulk insert per chunk, as trials', async () => {
    const res = await upload(coder, extraction, trialsCsv(ORDER));
    expect(res.status).toBe(201);
    setId = res.body.id;
    expectShape(trialSetSchema, res.body);
    expectShape(trialSetListSchema, (await coder.get(`/api/extractions/${extraction}/trial-sets`)).body);
    expect(res.body).toMatchObject({
      label: 'Experiment 1, order task', task: 'order', format: 'trials', rows: ORDER.length, trials: ORDER.length, participants: 12,
      conditions: ['synchronous', 'delayed'], levelMin: -240, levelMax: 240, uploadedBy: 'coder1', editable: true, fit: { state: 'none' },
    });
    expect(Number((await t.ctx.db('trial_rows').where({ trial_set_id: setId }).count({ c: '*' }).first())!.c)).toBe(ORDER.length);
    const csv = await coder.get(`/api/trial-sets/${setId}/trials.csv`);
    expect(csv.status).toBe(200);
    expect(csv.text.split('\n')[0]).toBe('participant,condition,level,response');
    expect(csv.text.split('\n').length).toBe(ORDER.length + 2);
  });

  it('runs the fits as a job with progress, then lists one fit per participant × condition with its flags', async () => {
    const res = await coder.post(`/api/trial-sets/${setId}/fits`).send({ resamples: 200 });
    expect(res.status).toBe(202);
    expect(res.body.total).toBe(24);
    expectShape(fitStartedSchema, res.body);
    expect(res.body.jobId).toEqual(expect.any(String));
    const again = await coder.post(`/api/trial-sets/${setId}/fits`).send({ resamples: 200 });
    expect([202, 409]).toContain(again.status);
    detail = await waitForFits(coder, setId, progress);
    expect(detail.set.fit).toMatchObject({ state: 'done', done: 24, total: 24, resamples: 200, error: null });
    expect(detail.fits).toHaveLength(24);
    expectShape(trialSetDetailSchema, detail);
    expect(progress.every((v, i) => i === 0 || v >= progress[i - 1])).toBe(true);
    const f = detail.fits[0];
    expect(f).toMatchObject({ participant: 'P01', condition: 'synchronous', kind: 'psychometric', x: ORDER_SOAS, resamples: 200 });
    expect(f.fit.converged).toBe(true);
    expect(f.ci.pse.lower).toBeLessThan(f.fit.pse);
    expect(f.ci.pse.upper).toBeGreaterThan(f.fit.pse);
    for (const fit of detail.fits) for (const flag of fit.flags) expect(typeof flag.commonPractice).toBe('boolean');
  }, 120_000);

  it('codes PSS A − B as a mean difference whose mean, SD, r and variance match statsmodels + numpy on the same trials', async () => {
    const res = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'pse', conditionA: 'delayed', conditionB: 'synchronous' });
    expect(res.status).toBe(200);
    expectShape(contrastSchema, res.body);
    const cells = detail.fits.map((f: any) => ({ participant: f.participant, condition: f.condition, x: f.x, n: f.n, k: f.k }));
    const ref = runReference<{ n: number; mean_diff: number; sd_diff: number; r: number; mean1: number; mean2: number; variance: number; pse: Record<string, Record<string, number>> }>(
      'trials_reference.py',
      { cells, conditionA: 'delayed', conditionB: 'synchronous', model: 'probit' },
    );
    // statsmodels GLM (probit) per cell, numpy mean/std(ddof=1)/corrcoef of the fitted PSEs
    expect(res.body.summary.n).toBe(ref.n);
    expect(relErr(res.body.summary.mean_diff, ref.mean_diff)).toBeLessThan(1e-6);
    expect(relErr(res.body.summary.sd_diff, ref.sd_diff)).toBeLessThan(1e-6);
    expect(relErr(res.body.summary.r, ref.r)).toBeLessThan(1e-6);
    expect(relErr(res.body.summary.mean1, ref.mean1)).toBeLessThan(1e-6);
    expect(res.body.form).toBe('mean_diff');
    expect(res.body.effect.metric).toBe('mean_diff');
    expect(relErr(res.body.effect.effect, ref.mean_diff)).toBeLessThan(1e-6);
    expect(relErr(res.body.effect.variance, ref.variance)).toBeLessThan(1e-6);
    expect(res.body.effect.formula).toBe('md.paired.sd_diff');
    expect(res.body.derivation).toMatchObject({ source: 'trial_data', trialSetId: setId, parameter: 'pse', n: 12, setLabel: 'Experiment 1, order task' });
    // the invented shift is 40 ms
    expect(res.body.summary.mean_diff).toBeGreaterThan(15);
    expect(res.body.summary.mean_diff).toBeLessThan(65);
  });

  it('codes a log ratio of JNDs on the observed r; refuses a log ratio of PSSs, a parameter of the other task and an unknown condition', async () => {
    const jnd = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'jnd', conditionA: 'delayed', conditionB: 'synchronous', measure: 'log_ratio' });
    expect(jnd.status).toBe(200);
    expect(jnd.body.form).toBe('log_ratio_paired');
    expect(jnd.body.reported.r).toBeCloseTo(jnd.body.summary.r, 12);
    expect(jnd.body.effect.effect).toBeCloseTo(Math.log(jnd.body.summary.mean1 / jnd.body.summary.mean2), 12);
    const s = jnd.body.summary;
    const a = s.sd1 / s.mean1;
    const b = s.sd2 / s.mean2;
    // Lajeunesse (2011) eq. 8 with the observed r
    expect(jnd.body.effect.variance).toBeCloseTo((a * a + b * b - 2 * s.r * a * b) / s.n, 12);
    const pseRatio = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'pse', conditionA: 'delayed', conditionB: 'synchronous', measure: 'log_ratio' });
    expect(pseRatio.status).toBe(422);
    const width = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'width', conditionA: 'delayed', conditionB: 'synchronous' });
    expect(width.status).toBe(400);
    const unknown = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'pse', conditionA: 'delayed', conditionB: 'adapted' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.details[0].path).toBe('query.conditionB');
    const same = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'pse', conditionA: 'delayed', conditionB: 'delayed' });
    expect(same.status).toBe(400);
  });

  let derivedSheet: any;
  it('saves a derived effect with the numbers of its fits, whatever the client sent', async () => {
    const got = await coder.get(`/api/trial-sets/${setId}/contrast`).query({ parameter: 'pse', conditionA: 'delayed', conditionB: 'synchronous' });
    const x = await coder.get(`/api/extractions/${extraction}`);
    derivedSheet = {
      notes: '',
      studies: [
        {
          label: 'Experiment 1', design: 'within', n1: 12, population: 'healthy_adults', modality: 'audiovisual', task: 'temporal_order_judgement',
          effects: [
            {
              label: 'delayed vs synchronous', outcome: 'temporal_order', manipulation: 'luminance', form: 'mean_diff',
              reported: { mean_diff: 999, sd_diff: 1, n: 3 }, locator: 'trial data',
              derivation: { source: 'trial_data', trialSetId: setId, parameter: 'pse', conditionA: 'delayed', conditionB: 'synchronous', measure: 'mean_diff' },
            },
          ],
        },
      ],
    };
    const saved = await coder.put(`/api/extractions/${extraction}`).send({ version: x.body.extraction.version, sheet: derivedSheet });
    expect(saved.status).toBe(200);
    const e = saved.body.studies[0].effects[0];
    expect(e.reported.mean_diff).toBeCloseTo(got.body.summary.mean_diff, 10);
    expect(e.reported.n).toBe(12);
    expect(e.computed.effect).toBeCloseTo(got.body.effect.effect, 10);
    expect(e.computed.variance).toBeCloseTo(got.body.effect.variance, 10);
    expect(e.derivation).toMatchObject({ source: 'trial_data', trialSetId: setId, r: got.body.summary.r, n: 12 });
    const row = await t.ctx.db('effects').where({ id: e.id }).first();
    expect(row.trial_set_id).toBe(setId);

    const foreign = structuredClone(derivedSheet);
    foreign.studies[0].effects[0].derivation.trialSetId = 999999;
    const bad = await coder.put(`/api/extractions/${extraction}`).send({ version: saved.body.version, sheet: foreign });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details[0]).toEqual({ path: 'sheet.studies.0.effects.0.derivation', message: 'trial data set 999999 is not on this sheet' });
  });

  it('shows trial data to the coder and curators only; only the coder uploads and fits', async () => {
    expect((await curator.get(`/api/trial-sets/${setId}`)).status).toBe(200);
    expect((await curator.get(`/api/extractions/${extraction}/trial-sets`)).status).toBe(200);
    expect((await curator.get(`/api/trial-sets/${setId}/trials.csv`)).status).toBe(200);
    // a sheet or set the caller cannot see answers exactly like one that does not exist
    const missingSet = await curator.get('/api/trial-sets/999999');
    const missingSheet = await curator.get('/api/extractions/999999/trial-sets');
    expect(missingSet.status).toBe(404);
    for (const agent of [coder2]) {
      for (const path of [`/api/trial-sets/${setId}`, `/api/trial-sets/${setId}/trials.csv`, `/api/trial-sets/${setId}/contrast?parameter=pse&conditionA=delayed&conditionB=synchronous`]) {
        const res = await agent.get(path);
        expect(res.status, path).toBe(404);
        expect(res.body, path).toEqual({ error: { ...missingSet.body.error, message: `No trial data set ${setId}.` } });
      }
      const list = await agent.get(`/api/extractions/${extraction}/trial-sets`);
      expect(list.status).toBe(404);
      expect(list.body).toEqual({ error: { ...missingSheet.body.error, message: `No extraction ${extraction}.` } });
      expect((await upload(agent, extraction, trialsCsv(ORDER))).status).toBe(404);
      expect((await agent.post(`/api/trial-sets/${setId}/fits`).send({})).status).toBe(404);
    }
    const fit = await curator.post(`/api/trial-sets/${setId}/fits`).send({});
    expect(fit.status).toBe(403);
    const up = await upload(curator, extraction, trialsCsv(ORDER));
    expect(up.status).toBe(403);
    expect(up.body.error.message).toMatch(/Only the coder of this sheet/);
    // non-contributors are refused by role, the same for an existing and a missing id
    // an admin holds the curator role: sees the trial data, may not upload
    const admin = await signIn(t.app, 'admin');
    expect((await admin.get(`/api/trial-sets/${setId}`)).status).toBe(200);
    const adminUpload = await upload(admin, extraction, trialsCsv(ORDER));
    expect(adminUpload.status).toBe(403);
    expect(adminUpload.body.error.message).toMatch(/Only the coder of this sheet/);
    for (const agent of [reviewer, await signIn(t.app, 'reader')]) {
      const seen = await agent.get(`/api/trial-sets/${setId}`);
      expect(seen.status).toBe(403);
      expect(seen.body).toEqual((await agent.get('/api/trial-sets/999999')).body);
      expect((await upload(agent, extraction, trialsCsv(ORDER))).status).toBe(403);
    }
    expect((await anonymous(t.app).get(`/api/trial-sets/${setId}`)).status).toBe(401);
    expect((await anonymous(t.app).post(`/api/trial-sets/${setId}/fits`).send({})).status).toBe(401);
  });

  it('takes per-level counts and fits a simultaneity window with its plausibility flags', async () => {
    const sj = inventTrials({ task: 'simultaneity', participants: 6, conditions: { near: 0, far: 60 }, levels: SJ_SOAS, trialsPerLevel: 16, seed: 1503 });
    const res = await upload(coder, extraction, countsCsv(sj), { task: 'simultaneity', label: 'Experiment 2, simultaneity', filename: 'sj.csv' });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ format: 'counts', rows: 6 * 2 * 9, trials: sj.length, participants: 6 });
    const id = res.body.id;
    expect((await coder.post(`/api/trial-sets/${id}/fits`).send({ resamples: 100 })).status).toBe(202);
    const d = await waitForFits(coder, id);
    expect(d.set.fit.state).toBe('done');
    expect(d.fits).toHaveLength(12);
    expect(d.fits[0].kind).toBe('simultaneity');
    expect(d.fits.every((f: any) => typeof f.fit.width === 'number')).toBe(true);
    const c = await coder.get(`/api/trial-sets/${id}/contrast`).query({ parameter: 'width', conditionA: 'far', conditionB: 'near' });
    expect(c.status).toBe(200);
    expect(c.body.summary.mean_diff).toBeGreaterThan(40);
    const csv = await coder.get(`/api/trial-sets/${id}/trials.csv`);
    expect(csv.text.split('\n')[0]).toBe('participant,condition,level,n,k');
  }, 120_000);

  it('comes with the snapshot that uses a derived effect', async () => {
    const other = await insertReference(t.ctx.db, { firstAuthor: 'Brackwater', year: 2021 });
    const stored = (await coder.get(`/api/extractions/${extraction}`)).body.studies;
    await t.ctx.db.transaction(async (trx) => {
      await createSettledRecord(trx, { referenceId: ref, sheet: toSheet(stored) });
      await createSettledRecord(trx, {
        referenceId: other,
        sheet: {
          studies: [
            {
              label: 'Experiment 1', design: 'within', n1: 20, population: 'healthy_adults', modality: 'audiovisual', task: 'temporal_order_judgement',
              effects: [{ label: 'delayed vs synchronous', outcome: 'temporal_order', manipulation: 'luminance', form: 'mean_diff', reported: { mean_diff: 30, sd_diff: 40, n: 20 } }],
            },
          ],
        },
      });
    });
    const body = { filters: { outcome: 'temporal_order', metric: 'mean_diff' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
    const snap = await reviewer.post('/api/snapshots').send(body);
    expect(snap.status).toBe(201);
    const csv = await request(t.app).get(`/api/snapshots/${snap.body.id}/trials.csv`);
    expect(csv.status).toBe(200);
    const lines = csv.text.trim().split('\n');
    expect(lines[0]).toBe('trial_set_id,trial_set,task,participant,condition,level,n,k');
    expect(lines.length - 1).toBe(ORDER.length);
    expect(lines[1]).toMatch(new RegExp(`^${setId},`));
  });
});

