import { randomBytes } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { Redis } from 'ioredis';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations, plans } from '../../api/db/schema.js';
import { REDIS_KEY_PREFIX } from '../../api/services/rate-limit-stores.js';
import { estimateExamples } from '../../shared/schemas/estimate-examples.js';
import { problemSchema } from '../../shared/schemas/problem.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const BUDGET = 100;
const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
// alderRowTownhouse: 14 treads, no landings, no pixels, no catalog → 1 + 14 = 15 units (api/routes/sizing-costs.ts)
const STAIR_COST = 15;

/** An organisation on a plan with a small cost budget and a request rate that never binds here. */
async function organizationOnBudget(t: TestApp) {
  const planId = `cost-${randomBytes(3).toString('hex')}`;
  await t.database.db.insert(plans).values({ id: planId, name: 'Cost test', monthlyQuota: 1_000_000, ratePerMinute: 10_000, costPerMinute: BUDGET });
  const org = await createOrganization(t);
  await t.database.db.update(organizations).set({ planId }).where(eq(organizations.id, org.id));
  return org;
}

type App = TestApp['app'];
const post = (app: App, token: string, path: string, body: object) => request(app).post(path).set('Authorization', `Bearer ${token}`).send(body);

describe('per-key cost budget (issue 9, item 2)', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await createTestApp();
  });
  afterAll(() => t.close());

  it('charges each call its work, advertises a draft-8 "cost" policy, and refuses what no longer fits with 429 cost_budget_exceeded', async () => {
    const org = await organizationOnBudget(t);
    const { token } = await createKey(t, org.id);

    const first = await post(t.app, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    expect(first.headers['ratelimit-policy']).toContain(`"cost"; q=${BUDGET}; w=60`);
    expect(first.headers.ratelimit).toContain(`"cost"; r=${BUDGET - STAIR_COST};`);
    // The request-rate entries stay beside it.
    expect(first.headers['ratelimit-policy']).toContain('"api-key"');

    // arithmetic: 6 × 15 = 90 ≤ 100; a seventh stair would make 105
    for (let i = 1; i < 6; i++) await post(t.app, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    const refused = await post(t.app, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(429);
    expect(refused.headers['content-type']).toContain('application/problem+json');
    const problem = problemSchema.parse(refused.body);
    expect(problem.code).toBe('cost_budget_exceeded');
    expect(problem.detail).toContain(`costs ${STAIR_COST}`);
    expect(Number(refused.headers['retry-after'])).toBeGreaterThanOrEqual(1);
    expect(Number(refused.headers['retry-after'])).toBeLessThanOrEqual(60);

    // The refused call was not charged: the 10 units left still buy ten one-unit calls, not eleven.
    for (let i = 0; i < BUDGET - 6 * STAIR_COST; i++) await post(t.app, token, '/v1/calculations/voltage-drop', VOLTAGE_DROP).expect(200);
    const empty = await post(t.app, token, '/v1/calculations/voltage-drop', VOLTAGE_DROP).expect(429);
    expect(empty.body.code).toBe('cost_budget_exceeded');
  });

  it('weighs pixels: an 18 m rail of 60 pixels/m costs 1 + 1080 / 10 = 109 units, more than the whole budget', async () => {
    const org = await organizationOnBudget(t);
    const { token } = await createKey(t, org.id);
    const res = await post(t.app, token, '/v1/estimates', estimateExamples.quaysideCorridor).expect(429);
    expect(res.body.detail).toContain('costs 109');
    // Nothing was spent: a small call still has the whole budget.
    const small = await post(t.app, token, '/v1/calculations/voltage-drop', VOLTAGE_DROP).expect(200);
    expect(small.headers.ratelimit).toContain(`"cost"; r=${BUDGET - 1};`);
  });

  it('is per key: another key of the organisation has its own budget', async () => {
    const org = await organizationOnBudget(t);
    const { token: a } = await createKey(t, org.id);
    const { token: b } = await createKey(t, org.id);
    for (let i = 0; i < 6; i++) await post(t.app, a, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    await post(t.app, a, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(429);
    await post(t.app, b, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
  });

  it('is checked after validation: a malformed body is a 400 and costs nothing', async () => {
    const org = await organizationOnBudget(t);
    const { token } = await createKey(t, org.id);
    await post(t.app, token, '/v1/estimates', { layout: 'tread-strips' }).expect(400);
    const ok = await post(t.app, token, '/v1/calculations/voltage-drop', VOLTAGE_DROP).expect(200);
    expect(ok.headers.ratelimit).toContain(`"cost"; r=${BUDGET - 1};`);
  });
});

// Needs a Redis server (.ci/run sets REDIS_URL=redis://127.0.0.1:6379).
const REDIS_URL = process.env.REDIS_URL;
describe.skipIf(!REDIS_URL)('the cost budget shared through Redis', () => {
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
    if (keyIds.length) await redis.del(...keyIds.map((keyId) => `${REDIS_KEY_PREFIX}cost:${keyId}`));
    await redis.quit();
    await closeTraffic(second);
    await closeTraffic(t.app);
    await t.close();
  });

  it('counts one key’s cost once, whichever instance serves the call, with an expiry of one window', async () => {
    const org = await organizationOnBudget(t);
    const { token, key } = await createKey(t, org.id);
    keyIds.push(key.keyId);
    for (let i = 0; i < 3; i++) await post(t.app, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    const onSecond = await post(second, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    expect(onSecond.headers.ratelimit).toContain(`"cost"; r=${BUDGET - 4 * STAIR_COST};`);
    for (let i = 0; i < 2; i++) await post(second, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(200);
    expect((await post(t.app, token, '/v1/estimates', estimateExamples.alderRowTownhouse).expect(429)).body.code).toBe('cost_budget_exceeded');

    const stored = `${REDIS_KEY_PREFIX}cost:${key.keyId}`;
    expect(Number(await redis.get(stored))).toBe(6 * STAIR_COST);
    const ttl = await redis.pttl(stored);
    expect(ttl).toBeGreaterThan(0);
    expect(ttl).toBeLessThanOrEqual(60_000);
  });
});
