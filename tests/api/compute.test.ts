import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, type TestApp } from '../support/test-app.js';
import { pool, computeEffect } from '../../shared/stats/index.js';

describe('POST /api/compute/pool and /api/compute/effect', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(() => t.close());

  const input = { effects: [0.1, 0.3, 0.5, 0.9], variances: [0.01, 0.02, 0.04, 0.1], method: 'REML', hksj: true, level: 0.9 };

  it('pools for anyone (signed out, no Origin) and returns the library result', async () => {
    const res = await request(t.app).post('/api/compute/pool').send(input);
    expect(res.status).toBe(200);
    expect(res.body).toEqual(JSON.parse(JSON.stringify(pool(input as never))));
  });

  it('applies the defaults (DL, no HKSJ, 95%)', async () => {
    const res = await request(t.app).post('/api/compute/pool').send({ effects: input.effects, variances: input.variances });
    expect(res.status).toBe(200);
    expect([res.body.method, res.body.hksj, res.body.level]).toEqual(['DL', false, 0.95]);
  });

  it('accepts 200,000 effects (beyond the default 2 MB JSON limit) and refuses more', async () => {
    const k = 200_000;
    const effects = Array.from({ length: k }, (_, i) => Math.sin(i) * 0.5);
    const variances = Array.from({ length: k }, (_, i) => 0.01 + (i % 97) / 500);
    const ok = await request(t.app).post('/api/compute/pool').send({ effects, variances });
    expect(ok.status).toBe(200);
    expect(ok.body.k).toBe(k);
    expect(ok.body.weights).toHaveLength(k);
    const tooMany = await request(t.app).post('/api/compute/pool').send({ effects: [...effects, 0], variances: [...variances, 1] });
    expect(tooMany.status).toBe(400);
    expect(tooMany.body.error.code).toBe('invalid_input');
    expect(tooMany.body.error.message).toMatch(/^Effects: at most/);
  });

  it('refuses bad input with the error shape and the offending position', async () => {
    const cases: [unknown, RegExp][] = [
      [{ effects: [1, 2], variances: [1, 0] }, /variances\[1\] must be a positive finite number/],
      [{ effects: [1, 2], variances: [1] }, /same length/],
      [{ effects: [], variances: [] }, /^Effects: /],
      [{ effects: [1], variances: [1], method: 'ML' }, /^Method: choose one of the listed values/],
      [{ effects: ['a'], variances: [1] }, /^Effect 1: enter a number/],
    ];
    for (const [body, message] of cases) {
      const res = await request(t.app).post('/api/compute/pool').send(body as object);
      expect(res.status, JSON.stringify(body)).toBe(400);
      expect(res.body.error.code).toBe('invalid_input');
      expect(res.body.error.message).toMatch(message);
    }
    const broken = await request(t.app).post('/api/compute/pool').set('Content-Type', 'application/json').send('{"effects":');
    expect(broken.status).toBe(400);
    expect(broken.body.error.message).toMatch(/not valid JSON/);
  });

  it('computes an effect size with its formula id, and refuses missing fields', async () => {
    const body = { measure: 'smd_paired', mean_diff: 5, sd_diff: 10, n: 50, r: 0.5 };
    const res = await request(t.app).post('/api/compute/effect').send(body);
    expect(res.status).toBe(200);
    expect(res.body).toEqual(computeEffect(body));
    expect(res.body.formula).toBe('smd.paired.sd_diff');
    const bad = await request(t.app).post('/api/compute/effect').send({ measure: 'smd', t: 2 });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/smd needs one of these sets of fields/);
    const unknown = await request(t.app).post('/api/compute/effect').send({ measure: 'odds_ratio' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe('invalid_input');
  });
});

describe('rate limit on the compute routes', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp({ env: { CALLER_BUDGET_PER_MINUTE: '3' } });
  });
  afterAll(() => t.close());

  it('answers 429 in the error shape once a caller has spent its budget for the minute', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 5; i++) statuses.push((await request(t.app).post('/api/compute/effect').send({ measure: 'fisher_z', r: 0.3, n: 20 })).status);
    expect(statuses.slice(0, 3)).toEqual([200, 200, 200]);
    expect(statuses[4]).toBe(429);
    const res = await request(t.app).post('/api/compute/pool').send({ effects: [1], variances: [1] });
    expect(res.status).toBe(429);
    expect(res.body.error.code).toBe('rate_limited');
  });
});
