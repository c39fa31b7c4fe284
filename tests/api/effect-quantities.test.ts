import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as schemaMigration from '../../migrations/20261205300000_add_effect_parameter_unit.js';
import * as backfill from '../../migrations/20261205300100_backfill_effect_parameter_unit.js';
import { compareSheets } from '../../server/services/comparison.js';
import { querySettledEffects } from '../../server/repositories/effects.js';
import { sheetDraftSchema } from '../../shared/schemas/extraction.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';
import { settleInventedReference } from './syntheses-fixtures.js';

// Each effect says what it measured and in which unit (issue 11): allowed per outcome kind, refused with one-click
// alternatives on save, and never pooled across parameters or units.
describe('effect parameters and units', () => {
  let t: TestApp;
  let coder1: Agent;
  let coder2: Agent;
  let curator: Agent;
  let sheetId: number;
  let version = 1;

  const sheetWith = (effect: Record<string, unknown>) => {
    const sheet = luminanceSheet();
    Object.assign(sheet.studies![0].effects![0], effect);
    return sheet;
  };

  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder1 = await signIn(t.app, 'coder1');
    coder2 = await signIn(t.app, 'coder2');
    curator = await signIn(t.app, 'curator');
    const refId = await insertReference(t.ctx.db, { firstAuthor: 'Oyelaran', year: 2018 });
    const claimed = await coder1.post('/api/extractions').send({ referenceId: refId });
    expect(claimed.status).toBe(201);
    sheetId = claimed.body.id;
  });
  afterAll(() => t.close());

  it('an effect saved without a parameter or unit stores its outcome kind’s usual ones, and answers them', async () => {
    const res = await coder1.put(`/api/extractions/${sheetId}`).send({ version, sheet: luminanceSheet() });
    expect(res.status).toBe(200);
    version = res.body.version;
    expect(res.body.studies[0].effects[0]).toMatchObject({ outcome: 'duration_distortion', parameter: 'duration_ratio', unit: 'ratio' });
  });

  it('a parameter its outcome kind does not allow is refused with 422 and the allowed alternatives; nothing is saved', async () => {
    const res = await coder1.put(`/api/extractions/${sheetId}`).send({ version, sheet: sheetWith({ parameter: 'pss', unit: 'ms' }) });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/Study 1, effect 1: Duration distortion records Perceived-duration ratio, PSE, Bisection point, Weber fraction, Odds of a response, not PSS/);
    const [problem] = res.body.error.details.problems;
    expect(problem).toMatchObject({ effect: 'studies.0.effects.0', path: 'body.sheet.studies.0.effects.0.parameter', field: 'parameter' });
    expect(problem.choices).toEqual([
      { label: 'Perceived-duration ratio (ratio)', set: { parameter: 'duration_ratio', unit: 'ratio' } },
      { label: 'PSE (ms)', set: { parameter: 'pse', unit: 'ms' } },
      { label: 'Bisection point (ms)', set: { parameter: 'bisection_point', unit: 'ms' } },
      { label: 'Weber fraction (no unit)', set: { parameter: 'weber_fraction', unit: 'none' } },
      { label: 'Odds of a response (no unit)', set: { parameter: 'response_odds', unit: 'none' } },
      { label: 'Keep PSS (ms): outcome kind Temporal order', set: { outcome: 'temporal_order' } },
      { label: 'Keep PSS (ms): outcome kind Recalibration shift', set: { outcome: 'recalibration_shift' } },
    ]);
    expect((await coder1.get(`/api/extractions/${sheetId}`)).body.extraction.version).toBe(version);

    // one click: the effect with the choice applied saves
    const chosen = await coder1.put(`/api/extractions/${sheetId}`).send({ version, sheet: sheetWith({ parameter: 'pss', unit: 'ms', ...problem.choices[1].set }) });
    expect(chosen.status).toBe(200);
    version = chosen.body.version;
    expect(chosen.body.studies[0].effects[0]).toMatchObject({ parameter: 'pse', unit: 'ms' });
  });

  it('a unit its parameter is not measured in is refused with the units it is', async () => {
    const res = await coder1.put(`/api/extractions/${sheetId}`).send({ version, sheet: sheetWith({ parameter: 'pse', unit: 'deg' }) });
    expect(res.status).toBe(422);
    expect(res.body.error.details.problems).toEqual([
      { effect: 'studies.0.effects.0', path: 'body.sheet.studies.0.effects.0.unit', field: 'unit', message: 'Study 1, effect 1: PSE is measured in ms, not deg', choices: [{ label: 'PSE (ms)', set: { unit: 'ms' } }] },
    ]);
    // an unknown value is a 400 naming the field
    const bad = await coder1.put(`/api/extractions/${sheetId}`).send({ version, sheet: sheetWith({ unit: 'furlongs' }) });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.map((d: { path: string }) => d.path)).toContain('body.sheet.studies.0.effects.0.unit');
  });

  it('refusals by role come before the check: another contributor 404 (as a missing id), signed out 401, a contributor editing a settled effect 403', async () => {
    const refused = { version, sheet: sheetWith({ parameter: 'pss' }) };
    const hidden = await coder2.put(`/api/extractions/${sheetId}`).send(refused);
    expect(hidden.status).toBe(404);
    expect(hidden.body.error.details).toBeUndefined();
    expect((await anonymous(t.app).put(`/api/extractions/${sheetId}`).send(refused)).status).toBe(401);
    const { referenceId } = await settleInventedReference(t.ctx.db, 'luminance', 2015, [{ mean1: 650, mean2: 600, sd: 80, n: 20 }]);
    const [row] = await querySettledEffects(t.ctx.db, { referenceId });
    const effect = { ...luminanceSheet().studies![0].effects![0], parameter: 'lag' };
    expect((await coder1.patch(`/api/effects/${row.id}`).send({ version: 1, reason: 'lag it is', effect })).status).toBe(403);
    const edit = await curator.patch(`/api/effects/${row.id}`).send({ version: 1, reason: 'lag it is', effect });
    expect(edit.status).toBe(422);
    expect(edit.body.error.details.problems[0]).toMatchObject({ path: 'body.effect.parameter', message: `Effect ${row.id}: Duration distortion records Perceived-duration ratio, PSE, Bisection point, Weber fraction, Odds of a response, not Lag` });
    // an edit that names no parameter keeps the stored one
    await t.ctx.db('effects').where({ id: row.id }).update({ parameter: 'weber_fraction', unit: 'percent' });
    const kept = await curator.patch(`/api/effects/${row.id}`).send({ version: 1, reason: 'corrected mean', effect: luminanceSheet().studies![0].effects![0] });
    expect(kept.status).toBe(200);
    expect(await t.ctx.db('effects').where({ id: row.id }).first('parameter', 'unit')).toEqual({ parameter: 'weber_fraction', unit: 'percent' });
    await t.ctx.db('effects').where({ id: row.id }).update({ parameter: 'duration_ratio', unit: 'ratio' });
  });

  it('two coders who recorded different parameters or units disagree on those fields', () => {
    const a = sheetDraftSchema.parse(sheetWith({ parameter: 'pse', unit: 'ms' }));
    const b = sheetDraftSchema.parse(sheetWith({ parameter: 'bisection_point', unit: 'ms' }));
    expect(compareSheets(a, b).map((d) => d.path)).toEqual(['studies.0.effects.0.parameter']);
    const c = sheetDraftSchema.parse(sheetWith({ parameter: 'duration_ratio', unit: 'percent' }));
    const d = sheetDraftSchema.parse(sheetWith({ parameter: 'duration_ratio', unit: 'ratio' }));
    expect(compareSheets(c, d).map((x) => x.path)).toEqual(['studies.0.effects.0.unit']);
  });

  it('a synthesis never pools different parameters or units: 422 in words with one choice per quantity, each of which pools', async () => {
    for (let i = 0; i < 3; i++) await settleInventedReference(t.ctx.db, 'size', 2010 + i, [{ mean1: 650 + i * 10, mean2: 600, sd: 80, n: 20 }]);
    for (let i = 0; i < 2; i++) await settleInventedReference(t.ctx.db, 'size', 2016 + i, [{ mean1: 640, mean2: 600 - i * 10, sd: 70, n: 16, parameter: 'pse', unit: 'ms' }]);
    const post = (body: object) => anonymous(t.app).post('/api/syntheses').send(body);
    const res = await post({ filters: { manipulation: 'size' } });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toMatch(/2 different quantities \(Perceived-duration ratio \(ratio\): 3, PSE \(ms\): 2\); effects of different parameters or units are never pooled together/);
    expect(res.body.error.details.quantities).toEqual([
      { parameter: 'duration_ratio', unit: 'ratio', label: 'Perceived-duration ratio (ratio)', count: 3 },
      { parameter: 'pse', unit: 'ms', label: 'PSE (ms)', count: 2 },
    ]);
    const choices = res.body.error.details.choices as Array<{ label: string; effects: number; request: any }>;
    expect(choices.map((c) => [c.label, c.request.filters])).toEqual([
      ['Only Perceived-duration ratio (ratio) (3 effects)', { manipulation: 'size', parameter: 'duration_ratio', unit: 'ratio' }],
      ['Only PSE (ms) (2 effects)', { manipulation: 'size', parameter: 'pse', unit: 'ms' }],
    ]);
    for (const c of choices) {
      const pooled = await post(c.request);
      expect(pooled.status).toBe(200);
      expect(pooled.body.counts.effects).toBe(c.effects);
    }
    // the facets offer parameters and units; the atlas gives each quantity its own cell
    const facets = (await anonymous(t.app).get('/api/syntheses/facets')).body;
    expect(facets.parameters).toEqual(expect.arrayContaining([{ value: 'pse', count: 2, label: 'PSE' }]));
    const atlas = (await anonymous(t.app).get('/api/atlas/manipulations/size')).body;
    expect(atlas.cells.map((c: any) => [c.quantityLabel, c.counts.effects, c.filters.parameter])).toEqual(
      expect.arrayContaining([
        ['Perceived-duration ratio (ratio)', 3, 'duration_ratio'],
        ['PSE (ms)', 2, 'pse'],
      ]),
    );
    // the effects export carries both columns
    const csv = await anonymous(t.app).get(`/api/syntheses/export/effects.csv?request=${encodeURIComponent(JSON.stringify(choices[1].request))}`);
    expect(csv.status).toBe(200);
    expect(csv.text.split('\n')[0]).toMatch(/outcome,parameter,unit/);
    expect(csv.text).toMatch(/duration_distortion,pse,ms/);
  });

  it('the migrations back-fill the usual parameter and unit, and go down again', async () => {
    const before = await t.ctx.db('effects').select('id', 'parameter', 'unit', 'effect', 'version').orderBy('id');
    await backfill.down(t.ctx.db);
    expect(new Set(await t.ctx.db('effects').pluck('parameter'))).toEqual(new Set([null]));
    await schemaMigration.down(t.ctx.db);
    expect(await t.ctx.db.schema.hasColumn('effects', 'parameter')).toBe(false);
    await schemaMigration.up(t.ctx.db);
    await backfill.up(t.ctx.db);
    const after = await t.ctx.db('effects').select('id', 'parameter', 'unit', 'effect', 'version').orderBy('id');
    // every effect takes its outcome kind's usual quantity; those coded otherwise (the two PSE effects, one of the sheet) change, the rest are as before
    const changed = after.filter((r, i) => r.parameter !== before[i].parameter || r.unit !== before[i].unit);
    expect(changed.map((r) => r.parameter)).toEqual(changed.map(() => 'duration_ratio'));
    expect(changed).toHaveLength(before.filter((r) => r.parameter === 'pse').length);
    expect(after.map((r) => [r.effect, r.version])).toEqual(before.map((r) => [r.effect, r.version]));
    await expect(t.ctx.db('effects').where({ id: after[0].id }).update({ parameter: 'pse', unit: null })).rejects.toThrow(/effects_unit_with_parameter/);
  });

  it('a synthesis pools one outcome kind at a time: 422 naming the kinds, one choice per outcome × parameter × unit × metric, each of which pools', async () => {
    // the same parameter, unit and metric under two outcome kinds (a PSS in ms as a mean difference)
    const pss = { mean1: 40, mean2: 10, sd: 30, n: 18, form: 'log_ratio' as const, parameter: 'pss', unit: 'ms' };
    for (let i = 0; i < 3; i++) await settleInventedReference(t.ctx.db, 'expectation', 2011 + i, [{ ...pss, form: 'smd', mean1: 40 + i * 5 }], 'temporal_order');
    for (let i = 0; i < 2; i++) await settleInventedReference(t.ctx.db, 'expectation', 2014 + i, [{ ...pss, form: 'smd', mean1: 30 + i * 5 }], 'recalibration_shift');
    await settleInventedReference(t.ctx.db, 'expectation', 2019, [{ ...pss, mean1: 60, parameter: 'jnd', unit: 'ratio' }], 'temporal_order');
    const post = (body: object) => anonymous(t.app).post('/api/syntheses').send(body);
    const res = await post({ filters: { manipulation: 'expectation', metric: 'g_s' } });
    expect(res.status).toBe(422);
    expect(res.body.error.message).toBe(
      'These effects are of 2 outcome kinds (Temporal order: 3, Recalibration shift: 2); a synthesis pools one outcome kind, parameter, unit and metric at a time. Add an outcome filter, e.g. "filters": { "outcome": "temporal_order" }, or take one of the choices.',
    );
    expect(res.body.error.details.outcomes).toEqual([
      { outcome: 'temporal_order', label: 'Temporal order', count: 3 },
      { outcome: 'recalibration_shift', label: 'Recalibration shift', count: 2 },
    ]);
    const choices = res.body.error.details.choices as Array<{ label: string; effects: number; request: any }>;
    expect(choices.map((c) => [c.label, c.request.filters])).toEqual([
      ["Only Temporal order · PSS (ms) · Hedges' g_s (independent groups) (3 effects)", { manipulation: 'expectation', metric: 'g_s', outcome: 'temporal_order', parameter: 'pss', unit: 'ms' }],
      ["Only Recalibration shift · PSS (ms) · Hedges' g_s (independent groups) (2 effects)", { manipulation: 'expectation', metric: 'g_s', outcome: 'recalibration_shift', parameter: 'pss', unit: 'ms' }],
    ]);
    for (const c of choices) {
      const pooled = await post(c.request);
      expect(pooled.status).toBe(200);
      expect(pooled.body.counts.effects).toBe(c.effects);
    }
    // with every metric: each outcome kind's quantities and metrics are their own choices
    const all = await post({ filters: { manipulation: 'expectation' } });
    expect(all.status).toBe(422);
    expect(all.body.error.details.outcomes.map((o: { count: number }) => o.count)).toEqual([4, 2]);
    expect(all.body.error.details.choices.map((c: { label: string }) => c.label)).toEqual([
      "Only Temporal order · PSS (ms) · Hedges' g_s (independent groups) (3 effects)",
      "Only Recalibration shift · PSS (ms) · Hedges' g_s (independent groups) (2 effects)",
      'Only Temporal order · JND (ratio) · log ratio of means (1 effect)',
    ]);
    // one outcome kind alone is not refused for its kind
    expect((await post({ filters: { manipulation: 'expectation', outcome: 'recalibration_shift' } })).status).toBe(200);
  });
});
