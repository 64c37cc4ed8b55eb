import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app.js';
import { ephemeralSecrets } from '../../api/auth/secrets.js';
import { createLogger } from '../../api/logger.js';
import { healthSchema } from '../../shared/schemas/health.js';
import { problemSchema } from '../../shared/schemas/problem.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, () => new Date('2026-12-01T09:30:00Z'));
});
afterAll(() => t.close());

describe('GET /v1/health', () => {
  it('answers ok with the versions and the server time', async () => {
    const res = await request(t.app).get('/v1/health').expect(200);
    expect(healthSchema.parse(res.body)).toMatchObject({ status: 'ok', time: '2026-12-01T09:30:00.000Z' });
  });

  it('mints an X-Request-Id and echoes a well-formed one the client sent', async () => {
    const minted = await request(t.app).get('/v1/health');
    expect(minted.headers['x-request-id']).toMatch(/^[0-9a-f-]{36}$/);
    const echoed = await request(t.app).get('/v1/health').set('X-Request-Id', 'checkout-42.a');
    expect(echoed.headers['x-request-id']).toBe('checkout-42.a');
  });

  it('replaces a malformed X-Request-Id instead of echoing it', async () => {
    const res = await request(t.app).get('/v1/health').set('X-Request-Id', 'bad id <script>');
    expect(res.headers['x-request-id']).not.toContain('script');
  });

  it('sets the security headers from helmet', async () => {
    const res = await request(t.app).get('/v1/health');
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

describe('GET /v1/health/ready', () => {
  it('reports the database as reachable', async () => {
    const res = await request(t.app).get('/v1/health/ready').expect(200);
    expect(res.body).toEqual({ status: 'ready', checks: { database: 'ok' } });
  });

  it('answers 503 problem+json when the database is gone', async () => {
    const unreachable = { ...t.database, ping: () => Promise.reject(new Error('connection refused')) };
    const app = createApp({ config: t.config, database: unreachable, logger: createLogger('silent'), secrets: ephemeralSecrets(), clock: () => new Date() });
    const res = await request(app).get('/v1/health/ready').expect(503);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(problemSchema.parse(res.body).code).toBe('not_ready');
  });
});

describe('errors', () => {
  it('answers an unknown API route with a 404 problem', async () => {
    const res = await request(t.app).get('/v1/no-such-thing').expect(404);
    expect(res.headers['content-type']).toContain('application/problem+json');
    expect(res.body).toMatchObject({ status: 404, code: 'not_found', instance: '/v1/no-such-thing' });
    expect(res.body.requestId).toBe(res.headers['x-request-id']);
  });

  it('answers malformed JSON with a 400 problem and no stack trace', async () => {
    const res = await request(t.app).post('/v1/health').set('Content-Type', 'application/json').send('{"treads": 14,').expect(400);
    expect(res.body.code).toBe('malformed_json');
    expect(JSON.stringify(res.body)).not.toMatch(/at .*\.(ts|js):\d+/);
  });

  it('answers a body over the limit with 413', async () => {
    const res = await request(t.app)
      .post('/v1/health')
      .set('Content-Type', 'application/json')
      .send(JSON.stringify({ pad: 'x'.repeat(300 * 1024) }))
      .expect(413);
    expect(res.body.code).toBe('body_too_large');
  });
});
