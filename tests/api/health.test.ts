import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createTestApp, type TestApp } from '../support/test-app.js';
import { readEnv } from '../../server/env.js';

describe('health and configuration', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(() => t.close());

  it('reports each part it depends on', async () => {
    const res = await request(t.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body.parts.database.state).toBe('up');
    expect(res.body.parts.oauth.state).toBe('up');
    expect(Object.keys(res.body.parts).sort()).toEqual(['database', 'doi', 'mail', 'oauth', 'search']);
  });

  it('answers 503 when the database is unreachable', async () => {
    const down = await createTestApp({ env: { DATABASE_URL: 'postgres://postgres@127.0.0.1:1/nothing' } });
    try {
      const res = await request(down.app).get('/api/health');
      expect(res.status).toBe(503);
      expect(res.body.parts.database.state).toBe('down');
    } finally {
      await down.close();
    }
  });

  it('answers unknown API paths and malformed JSON with the error shape', async () => {
    const missing = await request(t.app).get('/api/no-such-thing');
    expect(missing.status).toBe(404);
    expect(missing.body.error.code).toBe('not_found');
    const broken = await request(t.app).post('/api/tokens').set('Content-Type', 'application/json').send('{"name":');
    expect(broken.status).toBe(400);
    expect(broken.body.error.message).toMatch(/not valid JSON/);
  });

  it('stops the start with a list of every bad variable', () => {
    expect(() => readEnv({ DATABASE_URL: 'mysql://x', SESSION_SECRET: 'short', PORT: 'abc' })).toThrow(
      /DATABASE_URL[\s\S]*SESSION_SECRET[\s\S]*PORT|PORT[\s\S]*DATABASE_URL/,
    );
  });
});
