import { Redis } from 'ioredis';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REDIS_KEY_PREFIX } from '../../api/services/rate-limit-stores.js';
import { bearer } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const REDIS_URL = process.env.REDIS_URL;
const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const FREE_RATE_PER_MINUTE = 60; // the free plan of migrations/0001_accounts_keys_usage_audit.sql

type App = TestApp['app'];
const size = (app: App, token: string) => request(app).post('/v1/calculations/voltage-drop').set(bearer(token)).send(VOLTAGE_DROP);

// Needs a Redis server (.ci/run sets REDIS_URL=redis://127.0.0.1:6379).
describe.skipIf(!REDIS_URL)('two API instances sharing one Redis', () => {
  let t: TestApp;
  let second: App;
  let redis: Redis;
  const keyIds: string[] = [];

  beforeAll(async () => {
    t = await createTestApp({ REDIS_URL });
    second = anotherInstance(t, { REDIS_URL });
    redis = new Redis(REDIS_URL!);
  });
  afterAll(async () => {
    // Only this file's counters: the per-key entries of the keys it created.
    if (keyIds.length) await redis.del(...keyIds.map((keyId) => `${REDIS_KEY_PREFIX}api-key:${keyId}`));
    await redis.quit();
    await closeTraffic(second);
    await closeTraffic(t.app);
    await t.close();
  });

  it('use Redis for rate limits', () => {
    expect(t.app.locals.services.rateLimitStores.kind).toBe('redis');
    expect(second.locals.services.rateLimitStores.kind).toBe('redis');
  });

  it('count one key against one limit, whichever instance serves the call', async () => {
    const org = await createOrganization(t);
    const { token, key } = await createKey(t, org.id);
    keyIds.push(key.keyId);
    const half = FREE_RATE_PER_MINUTE / 2;

    for (let i = 0; i < half; i++) await size(t.app, token).expect(200);
    const onSecond = await size(second, token).expect(200);
    // The second instance's first call is the key's (half + 1)-th.
    expect(onSecond.headers.ratelimit).toContain(`"api-key"; r=${FREE_RATE_PER_MINUTE - half - 1};`);
    for (let i = 1; i < half; i++) await size(second, token).expect(200);

    const refusedFirst = await size(t.app, token).expect(429);
    expect(refusedFirst.body.code).toBe('rate_limited');
    expect(refusedFirst.headers['retry-after']).toMatch(/^\d+$/);
    await size(second, token).expect(429);

    const counted = await redis.get(`${REDIS_KEY_PREFIX}api-key:${key.keyId}`);
    expect(Number(counted)).toBe(FREE_RATE_PER_MINUTE + 2);
  });

  it('(control) without Redis, each instance would count on its own', async () => {
    const alone = await createTestApp();
    const other = anotherInstance(alone);
    const org = await createOrganization(alone);
    const { token } = await createKey(alone, org.id);
    await size(alone.app, token).expect(200);
    const res = await size(other, token).expect(200);
    expect(res.headers.ratelimit).toContain(`"api-key"; r=${FREE_RATE_PER_MINUTE - 1};`);
    await closeTraffic(other);
    await closeTraffic(alone.app);
    await alone.close();
  });
});
