import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import { gunzipSync } from 'node:zlib';
import { createTestApp, resetDb, type TestApp } from '../support/test-app.js';
import { settleInventedReference } from './syntheses-fixtures.js';

/** POSTs JSON and returns the raw bytes as sent (no client-side decompression). */
function rawPost(port: number, path: string, body: unknown, acceptEncoding?: string) {
  return new Promise<{ status: number; headers: http.IncomingHttpHeaders; bytes: Buffer }>((resolve, reject) => {
    const data = JSON.stringify(body);
    const req = http.request(
      { host: '127.0.0.1', port, path, method: 'POST', headers: { 'Content-Type': 'application/json', 'Content-Length': Buffer.byteLength(data), ...(acceptEncoding ? { 'Accept-Encoding': acceptEncoding } : {}) } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, bytes: Buffer.concat(chunks) }));
      },
    );
    req.on('error', reject);
    req.end(data);
  });
}

describe('compressed answers (issue 10, Load)', () => {
  let t: TestApp;
  let server: http.Server;
  let port: number;
  beforeAll(async () => {
    t = await createTestApp();
    await resetDb(t.ctx.db);
    for (let r = 0; r < 5; r++) {
      await settleInventedReference(t.ctx.db, 'looming_receding', 2012 + r, Array.from({ length: 30 }, (_, i) => ({ mean1: 512 + ((i * 7 + r) % 23), mean2: 500, sd: 38 + (i % 6), n: 18 + (i % 11) })));
    }
    server = t.app.listen(0, '127.0.0.1');
    await new Promise((r) => server.once('listening', r));
    port = (server.address() as AddressInfo).port;
  }, 60_000);
  afterAll(async () => {
    await new Promise((r) => server.close(r));
    await t.close();
  });

  it('gzips a large synthesis for a caller that accepts gzip, and sends the same JSON', async () => {
    const request = { filters: { manipulation: 'looming_receding' } };
    const zipped = await rawPost(port, '/api/syntheses', request, 'gzip');
    expect(zipped.status).toBe(200);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers.vary).toMatch(/Accept-Encoding/i);
    const plain = await rawPost(port, '/api/syntheses', request);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const unzipped = gunzipSync(zipped.bytes);
    expect(JSON.parse(unzipped.toString('utf8'))).toEqual(JSON.parse(plain.bytes.toString('utf8')));
    expect(JSON.parse(plain.bytes.toString('utf8')).rows).toHaveLength(150);
    // a synthesis answer is repetitive JSON: gzip makes it several times smaller
    expect(zipped.bytes.length).toBeLessThan(plain.bytes.length / 4);
  });

  it('leaves small answers (under 1 kB) and refusals in the error envelope readable as they are', async () => {
    const small = await rawPost(port, '/api/compute/effect', { measure: 'fisher_z', r: 0.3, n: 20 }, 'gzip');
    expect(small.status).toBe(200);
    expect(small.headers['content-encoding']).toBeUndefined();
    const refused = await rawPost(port, '/api/syntheses', { filters: { manipulation: 'no-such-term' } }, 'gzip');
    expect(refused.status).toBe(422);
    expect(JSON.parse(refused.bytes.toString('utf8')).error.code).toBe('unprocessable');
  });
});
