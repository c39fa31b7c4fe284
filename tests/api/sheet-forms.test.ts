import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as migration from '../../migrations/20261206900000_add_response_odds_parameter.js';
import { computeReported } from '../../shared/extraction/compute.js';
import { createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';

// The sheet's forms for a ratio or percent change with its CI and for 2×2 counts (issue 11), over the API.
describe('sheet forms: ratio and percent change with a CI, 2×2 counts', () => {
  let t: TestApp;
  let coder: Agent;
  let sheetId: number;
  let version = 1;

  const ratio = { ratio: 1.2, ci_lower: 1.0, ci_upper: 1.44, n: 20 };
  const percent = { percent: 12, ci_lower: 5, ci_upper: 19, n: 20 };
  const counts = { events1: 31, nonevents1: 9, events2: 18, nonevents2: 22 };

  const sheetWith = (effects: Record<string, unknown>[]) => {
    const sheet = luminanceSheet();
    const base = sheet.studies![0].effects![0];
    sheet.studies![0].effects = effects.map((e, i) => ({ ...base, label: `effect ${i + 1}`, ...e }));
    return sheet;
  };

  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    const refId = await insertReference(t.ctx.db, { firstAuthor: 'Quillfeather', year: 2022 });
    const claimed = await coder.post('/api/extractions').send({ referenceId: refId });
    expect(claimed.status).toBe(201);
    sheetId = claimed.body.id;
  });
  afterAll(() => t.close());

  it('the migration allows the response-odds parameter and goes down again while no effect records it', async () => {
    await migration.down(t.ctx.db);
    const insertCheck = () => t.ctx.db.raw(`SELECT pg_get_constraintdef(oid) AS def FROM pg_constraint WHERE conname = 'effects_parameter_known'`);
    expect((await insertCheck()).rows[0].def).not.toMatch(/response_odds/);
    await migration.up(t.ctx.db);
    expect((await insertCheck()).rows[0].def).toMatch(/response_odds/);
  });

  it('a coder saves effects from a ratio CI, a percent-change CI and 2×2 counts; the server computes each and submits', async () => {
    const saved = await coder.put(`/api/extractions/${sheetId}`).send({
      version,
      sheet: sheetWith([
        { form: 'ratio_ci', reported: ratio },
        { form: 'percent_change', reported: percent },
        { form: 'counts_2x2', reported: counts },
        { form: 'counts_smd', reported: counts },
      ]),
    });
    expect(saved.status).toBe(200);
    version = saved.body.version;
    const [r, p, c, d] = saved.body.studies[0].effects;
    expect(r.reported).toEqual(ratio);
    expect(r.computed).toMatchObject({ metric: 'log_ratio', formula: 'lnrom.ratio_ci.log', n: 20 });
    expect(r.computed.effect).toBeCloseTo(Math.log(1.2), 12);
    expect(r.computed.variance).toBeCloseTo(computeReported('ratio_ci', ratio).variance, 12);
    expect(p.computed).toMatchObject({ metric: 'log_ratio', formula: 'lnrom.percent_ci.linear' });
    expect(p.computed.variance).toBeCloseTo(computeReported('percent_change', percent).variance, 12);
    // 2×2 counts: ln(31·22/(9·18)), 1/31 + 1/9 + 1/18 + 1/22 (Woolf 1955); they record the odds of a response
    expect(c.computed).toMatchObject({ metric: 'log_odds_ratio', formula: 'lnor.counts', n: 80 });
    expect(c.computed.effect).toBeCloseTo(Math.log((31 * 22) / (9 * 18)), 12);
    expect(c.computed.variance).toBeCloseTo(1 / 31 + 1 / 9 + 1 / 18 + 1 / 22, 12);
    expect(c).toMatchObject({ parameter: 'response_odds', unit: 'none' });
    expect(d.computed).toMatchObject({ metric: 'g_s', formula: 'smd.ind.counts' });
    expect(d.computed.effect).toBeCloseTo((Math.log((31 * 22) / (9 * 18)) * Math.sqrt(3)) / Math.PI, 12);
    const stored = await t.ctx.db('effects').whereIn('report_form', ['counts_2x2', 'counts_smd']).select('metric', 'parameter', 'unit');
    expect(stored).toHaveLength(2);
    for (const row of stored) expect(row).toMatchObject({ parameter: 'response_odds', unit: 'none' });

    const submitted = await coder.post(`/api/extractions/${sheetId}/submit`).send({ version });
    expect(submitted.status, JSON.stringify(submitted.body)).toBe(200);
    expect(submitted.body.state).toBe('submitted');
  });

  it('the migration refuses to go down while an effect records the response-odds parameter', async () => {
    await expect(migration.down(t.ctx.db)).rejects.toThrow(/record the parameter response_odds/);
  });

  it('2×2 counts are refused for an outcome kind that does not pool log odds ratios, saying which metrics it takes', async () => {
    const other = await insertReference(t.ctx.db, { firstAuthor: 'Rasmussen', year: 2023 });
    const claimed = await coder.post('/api/extractions').send({ referenceId: other });
    const sheet = sheetWith([{ form: 'counts_2x2', reported: counts, outcome: 'simultaneity_window', parameter: 'window_width', unit: 'ms' }]);
    const saved = await coder.put(`/api/extractions/${claimed.body.id}`).send({ version: 1, sheet });
    expect(saved.status).toBe(200);
    const res = await coder.post(`/api/extractions/${claimed.body.id}/submit`).send({ version: saved.body.version });
    expect(res.status).toBe(400);
    const detail = res.body.error.details.find((x: { path: string }) => x.path === 'sheet.studies.0.effects.0.form');
    expect(detail.message).toMatch(/Simultaneity window is pooled as raw mean or mean difference, not log odds ratio/);
  });
});
