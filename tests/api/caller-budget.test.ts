import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, origin, resetDb, signIn, type TestApp } from '../support/test-app.js';
import { settleInventedReference, settleInventedSet } from './syntheses-fixtures.js';
import { bib } from '../support/references.js';

// One budget per caller across the API, weighted by cost (issue 10, Load): 120 units a minute (2 a second) here.
describe('one cost-weighted budget per caller', () => {
  let t: TestApp;
  const from = (ip: string) => ({
    get: (path: string) => request(t.app).get(path).set('X-Forwarded-For', ip),
    post: (path: string) => request(t.app).post(path).set('X-Forwarded-For', ip).set('Origin', origin()),
  });
  // 70,000 effects with short numbers: about 0.8 MB of JSON
  const big = { effects: Array.from({ length: 70_000 }, (_, i) => ((i % 97) - 48) / 100), variances: Array.from({ length: 70_000 }, (_, i) => 0.05 + (i % 13) / 100) };
  const cost = (res: request.Response) => Number(res.headers['x-request-cost']);

  beforeAll(async () => {
    t = await createTestApp({ env: { CALLER_BUDGET_PER_MINUTE: '120', TRUST_PROXY: '1' } });
    await resetDb(t.ctx.db);
    await settleInventedSet(t.ctx.db, 'luminance');
    // ten invented references of 30 studies with two effects each: a synthesis of 600 effects
    for (let r = 0; r < 10; r++) {
      await settleInventedReference(
        t.ctx.db,
        'numerosity',
        2010 + r,
        Array.from({ length: 30 }, (_, i) => ({ mean1: 510 + ((i + r) % 17), mean2: 500, sd: 40 + (i % 5), n: 20 + (i % 9), second: { mean1: 505 + (i % 11), mean2: 500 } })),
      );
    }
  }, 120_000);
  afterAll(() => t.close());

  it('charges a cheap read 1 unit and pooling by k (1 a thousand effects), and says so in headers', async () => {
    const a = from('198.51.100.1');
    const read = await a.get('/api/syntheses/facets');
    expect(read.status).toBe(200);
    expect(cost(read)).toBe(1);
    expect(read.headers['x-budget-per-minute']).toBe('120');
    const small = await a.post('/api/compute/pool').send({ effects: [0.1, 0.3, 0.2], variances: [0.04, 0.05, 0.03] });
    expect(small.status).toBe(200);
    expect(cost(small)).toBe(1);
    const large = await a.post('/api/compute/pool').send(big);
    expect(large.status).toBe(200);
    expect(cost(large)).toBe(71);
    expect(Number(large.headers['x-budget-remaining'])).toBeLessThan(120 - 71);
  });

  it('weights syntheses by the effects they cover; an answer kept for this registry version costs less', async () => {
    const a = from('198.51.100.2');
    const small = await a.post('/api/syntheses').send({ filters: { manipulation: 'luminance', metric: 'g_s' } });
    expect(small.status).toBe(200);
    const first = await a.post('/api/syntheses').send({ filters: { manipulation: 'numerosity' } });
    expect(first.status).toBe(200);
    expect(first.body.counts.effects).toBe(600);
    expect(first.headers['x-synthesis-cache']).toBe('miss');
    const again = await a.post('/api/syntheses').send({ filters: { manipulation: 'numerosity' } });
    expect(again.headers['x-synthesis-cache']).toBe('hit');
    expect(cost(first)).toBeGreaterThan(cost(small));
    expect(cost(again)).toBeLessThan(cost(first));
    const exported = await a.get(`/api/syntheses/export/effects.csv?request=${encodeURIComponent(JSON.stringify({ filters: { manipulation: 'numerosity' } }))}`);
    expect(exported.status).toBe(200);
    expect(cost(exported)).toBe(cost(first));
  });

  it('refuses a caller over budget with 429, Retry-After and the error envelope in words; other callers are unaffected', async () => {
    const flooder = from('198.51.100.3');
    expect((await flooder.post('/api/compute/pool').send(big)).status).toBe(200);
    // 120 − 71 = 49 units left: the next large pool (71) is refused and spends nothing, cheap reads still go through
    const refused = await flooder.post('/api/compute/pool').send(big);
    expect(refused.status).toBe(429);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(5);
    expect(refused.body.error.code).toBe('rate_limited');
    expect(refused.body.error.message).toMatch(/^Too many requests from you: Pooling 70000 effects costs \d+ units and you have \d+ of your 120 a minute left\. Try again in \d+ seconds\.$/);
    expect(refused.body.error.details).toMatchObject({ perMinute: 120 });
    expect((await flooder.get('/api/syntheses/facets')).status).toBe(200);
    // spend the rest on cheap reads until even those are refused
    let last = 200;
    for (let i = 0; i < 80 && last === 200; i++) last = (await flooder.get('/api/syntheses/facets')).status;
    expect(last).toBe(429);
    const cheapRefused = await flooder.get('/api/manipulations');
    expect(cheapRefused.status).toBe(429);
    expect(cheapRefused.body.error.message).toMatch(/A request costs 1 unit/);
    expect(Number(cheapRefused.headers['retry-after'])).toBeGreaterThanOrEqual(1);

    // another address, and a signed-in user behind the flooder's own address, each have their own budget
    expect((await from('198.51.100.4').post('/api/compute/pool').send(big)).status).toBe(200);
    const reviewer = await signIn(t.app, 'reviewer');
    reviewer.set('X-Forwarded-For', '198.51.100.3');
    expect((await reviewer.post('/api/compute/pool').send(big)).status).toBe(200);
    expect((await reviewer.post('/api/syntheses').send({ filters: { manipulation: 'luminance', metric: 'g_s' } })).status).toBe(200);
    // health checks are never charged
    expect((await flooder.get('/api/health')).status).toBe(200);
  }, 60_000);

  it('refuses a synthesis the caller cannot pay for before any database query', async () => {
    const flooder = from('198.51.100.5');
    let queries = 0;
    const count = () => queries++;
    t.ctx.db.on('query', count);
    try {
      // every request a different level, so none is kept: 1 + 2 units each (600 effects) until one is refused
      let refused: request.Response | undefined;
      for (let i = 0; i < 120 && !refused; i++) {
        queries = 0;
        const res = await flooder.post('/api/syntheses').send({ filters: { manipulation: 'numerosity' }, level: 0.9 + (i + 1) / 1000 });
        if (res.status === 429 && /A request costs/.test(res.body.error.message)) await new Promise((r) => setTimeout(r, 600)); // out of even the entry unit: wait for some
        else if (res.status === 429) refused = res;
        else expect(res.status).toBe(200);
      }
      expect(refused?.body.error.message).toMatch(/^Too many requests from you: A synthesis of 600 effects costs 2 units/);
      expect(queries).toBe(0);
    } finally {
      t.ctx.db.off('query', count);
    }
  }, 60_000);

  it('charges an import by its size before the body is read', async () => {
    const contributor = await signIn(t.app, 'coder1');
    const text = Array.from({ length: 150 }, (_, i) =>
      bib(`budget${i}`, { title: `Invented budget entry ${i} on filled durations`, author: 'Quillfeather, Ada', year: '2020', journal: 'Journal of Invented Timing', note: 'x'.repeat(300) }),
    ).join('\n');
    const res = await contributor.post('/api/imports').send({ format: 'bibtex', text });
    expect(res.status).toBe(201);
    expect(cost(res)).toBe(1 + Math.floor(Buffer.byteLength(JSON.stringify({ format: 'bibtex', text })) / 10_000));
    expect(cost(res)).toBeGreaterThan(5);
  }, 60_000);
});
