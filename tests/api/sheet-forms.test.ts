import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as migration from '../../migrations/20261206900000_add_response_odds_parameter.js';
import { computeReported } from '../../shared/extraction/compute.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
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

  it('on submit, n = 1 with an SD and an interval not centred on its estimate are refused beside their fields, in words', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Szabadkai', year: 2021 });
    const claimed = await coder.post('/api/extractions').send({ referenceId: ref });
    const sheet = sheetWith([
      { form: 'smd_paired', reported: { mean_diff: 40, sd_diff: 30, n: 1, r: 0.7 } },
      { form: 'ratio_ci', reported: { ratio: 1.2, ci_lower: 1.1, ci_upper: 1.6 } },
      { form: 'mean_diff', reported: { mean_diff: 12, ci_lower: 1, ci_upper: 30 } },
    ]);
    const saved = await coder.put(`/api/extractions/${claimed.body.id}`).send({ version: 1, sheet });
    expect(saved.status).toBe(200);
    expect(saved.body.studies[0].effects.map((e: { computed: unknown }) => e.computed)).toEqual([null, null, null]);
    const res = await coder.post(`/api/extractions/${claimed.body.id}/submit`).send({ version: saved.body.version });
    expect(res.status).toBe(400);
    const at = (path: string) => res.body.error.details.find((d: { path: string }) => d.path === `sheet.studies.0.effects.${path}`)?.message;
    expect(at('0.reported.n')).toBe('n = 1 cannot come with a standard deviation (sd_diff); an SD needs at least 2 observations');
    expect(at('1.reported.ci_lower')).toMatch(/the interval 1.1 to 1.6 is not centred on ratio 1.2 on either scale \(halves 0.087 and 0.288 on the log scale, 0.1 and 0.4 in ratio units\)/);
    expect(at('2.reported.ci_lower')).toMatch(/the interval 1 to 30 is not centred on mean_diff 12 \(halves 11 and 18\)/);
    expect((await t.ctx.db('extractions').where({ id: claimed.body.id }).first()).state).toBe('draft');
    // the stateless compute route refuses the same way, naming the field
    const route = await anonymous(t.app).post('/api/compute/effect').send({ measure: 'smd_paired', mean_diff: 40, sd_diff: 30, n: 1 });
    expect(route.status).toBe(400);
    expect(route.body.error.details).toEqual([{ path: 'body.n', message: 'n = 1 cannot come with a standard deviation (sd_diff); an SD needs at least 2 observations' }]);
  });

  it('p = 1 and F = 0 are accepted as an effect of 0 (no direction needed) and the sheet submits', async () => {
    const ref = await insertReference(t.ctx.db, { firstAuthor: 'Tiwari', year: 2020 });
    const claimed = await coder.post('/api/extractions').send({ referenceId: ref });
    const sheet = sheetWith([
      { form: 'smd', reported: { p: 1, n1: 20, n2: 20 } },
      { form: 'smd', reported: { F: 0, n1: 20, n2: 20 } },
    ]);
    const saved = await coder.put(`/api/extractions/${claimed.body.id}`).send({ version: 1, sheet });
    expect(saved.status).toBe(200);
    for (const e of saved.body.studies[0].effects) {
      expect(e.computed).toMatchObject({ metric: 'g_s', effect: 0 });
      expect(e.computed.variance).toBeCloseTo(0.1, 12);
    }
    const res = await coder.post(`/api/extractions/${claimed.body.id}/submit`).send({ version: saved.body.version });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const route = await anonymous(t.app).post('/api/compute/effect').send({ measure: 'smd', F: 0, n1: 20, n2: 20 });
    expect(route.body).toMatchObject({ metric: 'g_s', effect: 0 });
  });
});
