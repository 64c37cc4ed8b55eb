import { request as httpRequest, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { gunzipSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { COMPRESS_ABOVE_BYTES } from '../../api/middleware/compress.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
let sizing: string;
let manager: string;
let server: Server;
beforeAll(async () => {
  t = await createTestApp();
  server = t.app.listen(0, '127.0.0.1');
  await new Promise((resolve) => server.once('listening', resolve));
  const org = await createOrganization(t);
  ({ token: sizing } = await createKey(t, org.id, { scopes: ['sizing:run'] }));
  ({ token: manager } = await createKey(t, org.id, { scopes: ['keys:manage', 'sizing:run'] }));
});
afterAll(async () => {
  await new Promise((resolve) => server.close(resolve));
  await t.close();
});

interface Raw {
  status: number;
  headers: IncomingHttpHeaders;
  /** The bytes on the wire, not decoded. */
  bytes: Buffer;
}

/** One call over a real socket, so the test sees the encoded bytes (the test client would decode them). */
function raw(method: string, path: string, headers: Record<string, string>, body?: unknown): Promise<Raw> {
  const payload = body === undefined ? undefined : JSON.stringify(body);
  return new Promise((resolve, reject) => {
    const req = httpRequest(
      { host: '127.0.0.1', port: (server.address() as AddressInfo).port, method, path, headers: { ...headers, ...(payload ? { 'Content-Type': 'application/json' } : {}) } },
      (res) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => resolve({ status: res.statusCode ?? 0, headers: res.headers, bytes: Buffer.concat(chunks) }));
      },
    );
    req.on('error', reject);
    req.end(payload);
  });
}
const text = (r: Raw) => (r.headers['content-encoding'] === 'gzip' ? gunzipSync(r.bytes) : r.bytes).toString('utf8');

describe('large API answers are compressed (issue 9, item 2)', () => {
  it('an estimate goes gzip to a client that accepts it, decodes to the same JSON, and keeps X-Request-Id', async () => {
    const plain = await request(t.app).post('/v1/estimates').set('Authorization', `Bearer ${sizing}`).set('Accept-Encoding', 'identity').send(estimateExamples.alderRowTownhouse).expect(200);
    expect(plain.headers['content-encoding']).toBeUndefined();
    const identityBody = JSON.stringify(plain.body);
    expect(identityBody.length).toBeGreaterThan(COMPRESS_ABOVE_BYTES);

    const zipped = await raw('POST', '/v1/estimates', { Authorization: `Bearer ${sizing}`, 'Accept-Encoding': 'gzip' }, estimateExamples.alderRowTownhouse);
    expect(zipped.status).toBe(200);
    expect(zipped.headers['content-encoding']).toBe('gzip');
    expect(zipped.headers['x-request-id']).toMatch(/\S/);
    expect(zipped.headers['content-type']).toMatch(/^application\/json/);
    expect(zipped.bytes.length).toBeLessThan(identityBody.length / 3);
    const decoded = JSON.parse(text(zipped));
    expect(decoded.engineVersion).toBe(plain.body.engineVersion);
    expect(decoded.treads).toEqual(plain.body.treads);
  });

  it('a small answer goes uncompressed', async () => {
    const res = await raw('GET', '/v1/health', { 'Accept-Encoding': 'gzip' });
    expect(res.status).toBe(200);
    expect(res.bytes.length).toBeLessThan(COMPRESS_ABOVE_BYTES);
    expect(res.headers['content-encoding']).toBeUndefined();
  });

  it('a large problem+json answer stays problem+json with its request id when compressed', async () => {
    const badTreads = Array.from({ length: 60 }, () => -1);
    const res = await raw('POST', '/v1/calculations/reels', { Authorization: `Bearer ${sizing}`, 'Accept-Encoding': 'gzip', 'X-Request-Id': 'compress-problem-1' }, { piecesMm: badTreads });
    expect(res.status).toBe(400);
    expect(res.headers['content-encoding']).toBe('gzip');
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.headers['x-request-id']).toBe('compress-problem-1');
    const problem = JSON.parse(text(res));
    expect(problem.code).toBe('validation_failed');
    expect(problem.requestId).toBe('compress-problem-1');
  });

  it('an idempotent replay answers the same bytes, compressed or not', async () => {
    const create = (encoding: string) =>
      raw('POST', '/v1/keys', { Authorization: `Bearer ${manager}`, 'Idempotency-Key': 'compress-replay-1', 'Accept-Encoding': encoding }, { name: 'Replay over gzip' });
    const first = await create('gzip');
    const replay = await create('gzip');
    const plainReplay = await create('identity');
    expect([first.status, replay.status, plainReplay.status]).toEqual([201, 201, 201]);
    expect(text(replay)).toBe(text(first));
    expect(text(plainReplay)).toBe(text(first));
    expect(plainReplay.headers['content-encoding']).toBeUndefined();
  });
});
