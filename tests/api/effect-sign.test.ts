import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import * as migration from '../../migrations/20261206300000_add_effect_sign_reversed.js';
import { querySettledEffects } from '../../server/repositories/effects.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { insertReference, luminanceSheet } from './extraction-fixtures.js';
import { settleInventedReference } from './syntheses-fixtures.js';

// Duration distortion: positive = the manipulation lengthens perceived duration. A PSE (or bisection point) that is
// lower after the manipulation means lengthening, so the server reverses the computed sign and records that it did.
describe('sign convention of duration distortion', () => {
  let t: TestApp;
  let coder: Agent;
  let curator: Agent;
  let sheetId: number;
  let version = 1;

  const pseSheet = (task: string, parameter = 'pse') => {
    const sheet = luminanceSheet({ design: 'within' });
    sheet.studies![0].task = task as never;
    Object.assign(sheet.studies![0].effects![0], { parameter, unit: 'ms', form: 'mean_diff', reported: { mean_diff: -30, sd_diff: 60, n: 20 } });
    return sheet;
  };

  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    coder = await signIn(t.app, 'coder1');
    curator = await signIn(t.app, 'curator');
    const refId = await insertReference(t.ctx.db, { firstAuthor: 'Vantongeren', year: 2019 });
    const claimed = await coder.post('/api/extractions').send({ referenceId: refId });
    sheetId = claimed.body.id;
  });
  afterAll(() => t.close());

  it('a lower PSE in bisection is stored as a positive (lengthening) effect, flagged, with the reported values as entered', async () => {
    const res = await coder.put(`/api/extractions/${sheetId}`).send({ version, sheet: pseSheet('bisection') });
    expect(res.status).toBe(200);
    version = res.body.version;
    const [e] = res.body.studies[0].effects;
    expect(e.reported).toMatchObject({ mean_diff: -30 });
    expect(e.computed).toMatchObject({ metric: 'mean_diff', effect: 30, signReversed: true });
    expect(await t.ctx.db('effects').where({ id: e.id }).first('effect', 'sign_reversed')).toEqual({ effect: 30, sign_reversed: true });
    const shown = await coder.get(`/api/extractions/${sheetId}`);
    expect(shown.body.studies[0].effects[0].computed).toMatchObject({ effect: 30, signReversed: true });
  });

  it('the same contrast in reproduction (a perceived-duration ratio), or a PSE in reproduction, keeps its sign', async () => {
    for (const [task, parameter] of [['reproduction', 'duration_ratio'], ['reproduction', 'pse']]) {
      const sheet = pseSheet(task, parameter);
      if (parameter === 'duration_ratio') sheet.studies![0].effects![0].unit = 'ratio';
      const res = await coder.put(`/api/extractions/${sheetId}`).send({ version, sheet });
      expect(res.status).toBe(200);
      version = res.body.version;
      expect(res.body.studies[0].effects[0].computed).toMatchObject({ effect: -30, signReversed: false });
    }
  });

  it('a settled bisection point is reversed too, a curator’s edit recomputes it in the convention, and the migration goes down and up', async () => {
    const { referenceId } = await settleInventedReference(t.ctx.db, 'luminance', 2012, [{ mean1: 560, mean2: 600, sd: 80, n: 20, parameter: 'bisection_point', unit: 'ms', task: 'bisection' }]);
    const [row] = await querySettledEffects(t.ctx.db, { referenceId });
    expect(row.effect).toBeGreaterThan(0);
    const effect = { outcome: 'duration_distortion', manipulation: 'luminance', parameter: 'bisection_point', unit: 'ms', form: 'mean_diff', reported: { mean_diff: -25, sd_diff: 50, n: 20 } };
    const edit = await curator.patch(`/api/effects/${row.id}`).send({ version: 1, reason: 'the paper reports the shift', effect });
    expect(edit.status).toBe(200);
    expect(edit.body.effect).toBe(25);
    expect(await t.ctx.db('effects').where({ id: row.id }).first('sign_reversed')).toEqual({ sign_reversed: true });
    // the settled row answers the reversed value
    expect((await querySettledEffects(t.ctx.db, { referenceId }))[0].effect).toBe(25);
    expect((await anonymous(t.app).get(`/api/effects?referenceId=${referenceId}`)).status).toBe(200);
    await migration.down(t.ctx.db);
    expect(await t.ctx.db.schema.hasColumn('effects', 'sign_reversed')).toBe(false);
    await migration.up(t.ctx.db);
    expect(await t.ctx.db.schema.hasColumn('effects', 'sign_reversed')).toBe(true);
  });
});
