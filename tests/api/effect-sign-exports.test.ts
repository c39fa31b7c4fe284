import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import request from 'supertest';
import { SIGN_CONVENTIONS } from '../../shared/vocabulary/parameters.js';
import { anonymous, createTestApp, resetDb, signIn, type Agent, type TestApp } from '../support/test-app.js';
import { settleInventedReference } from './syntheses-fixtures.js';

const csvRows = (text: string) => Papa.parse<Record<string, string>>(text, { header: true, skipEmptyLines: true }).data;
const body = { filters: { manipulation: 'size', outcome: 'duration_distortion', parameter: 'pse', unit: 'ms', metric: 'g_s' }, method: 'DL', hksj: false, dependence: { mode: 'aggregate', r: 0.5 } };
const live = (file: string) => `/api/syntheses/export/${file}?request=${encodeURIComponent(JSON.stringify(body))}`;

// A PSE in bisection is reversed to keep duration distortion's sign convention (lower = longer); in reproduction it is not.
describe('reversed signs in the methods paragraph and the per-effect exports', () => {
  let t: TestApp;
  let reviewer: Agent;
  const reversedRefs: number[] = [];
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    reviewer = await signIn(t.app, 'reviewer');
    for (let i = 0; i < 5; i++) {
      const task = i < 2 ? 'bisection' : 'reproduction';
      const r = await settleInventedReference(t.ctx.db, 'size', 2010 + i, [{ mean1: 560 + 5 * i, mean2: 600, sd: 80, n: 20, parameter: 'pse', unit: 'ms', task: task as never }]);
      if (task === 'bisection') reversedRefs.push(r.referenceId);
    }
  });
  afterAll(() => t.close());

  it('each settled effect row says whether its sign was reversed', async () => {
    const res = await anonymous(t.app).get('/api/effects?manipulation=size&pageSize=50');
    expect(res.status).toBe(200);
    expect(res.body.items).toHaveLength(5);
    for (const e of res.body.items) expect(e.signReversed).toBe(reversedRefs.includes(e.referenceId));
    // a lower PSE in bisection means lengthening: stored positive; in reproduction the same contrast stays negative
    for (const e of res.body.items) expect(Math.sign(e.effect)).toBe(reversedRefs.includes(e.referenceId) ? 1 : -1);
  });

  it('the live per-effect CSV and JSON carry sign_reversed (and the bound and median flags)', async () => {
    const csv = await request(t.app).get(live('effects.csv'));
    expect(csv.status).toBe(200);
    const rows = csvRows(csv.text);
    expect(rows).toHaveLength(5);
    for (const r of rows) {
      expect(r.sign_reversed).toBe(String(reversedRefs.includes(Number(r.reference_id))));
      expect(r.from_bound).toBe('false');
      expect(r.approximate).toBe('false');
    }
    const json = JSON.parse((await request(t.app).get(live('synthesis.json'))).text);
    expect(json.effects.filter((e: { signReversed: boolean }) => e.signReversed)).toHaveLength(2);
  });

  it("a snapshot's methods paragraph names the pooled parameter, its unit, the sign convention and how many signs were reversed", async () => {
    const saved = await reviewer.post('/api/snapshots').send(body);
    expect(saved.status).toBe(201);
    const methods = (await request(t.app).get(`/api/snapshots/${saved.body.id}/methods.txt`)).text;
    expect(methods).toContain(`The pooled parameter (unit) was PSE (ms), for duration distortion; sign convention: ${SIGN_CONVENTIONS.duration_distortion}.`);
    expect(methods).toContain('Of the 5 effects, 2 had their sign reversed when coded');
    const frozen = csvRows((await request(t.app).get(`/api/snapshots/${saved.body.id}/effects.csv`)).text);
    expect(frozen.filter((r) => r.sign_reversed === 'true')).toHaveLength(2);
  });
});
