import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadConfig } from '../../api/config.js';
import { usageCounters } from '../../api/db/schema.js';
import { bearer } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
// Only the call-count rule may write during these tests: the interval is an hour.
const AFTER_FIVE = { USAGE_FLUSH_INTERVAL_MS: '3600000', USAGE_FLUSH_AFTER_CALLS: '5' };

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
});

type App = TestApp['app'];
const size = (app: App, token: string) => request(app).post('/v1/calculations/voltage-drop').set(bearer(token)).send(VOLTAGE_DROP).expect(200);

async function storedCount(organizationId: string): Promise<number> {
  const [row] = await t.database.db
    .select({ n: sql<string>`coalesce(sum(${usageCounters.count}), 0)` })
    .from(usageCounters)
    .where(eq(usageCounters.organizationId, organizationId));
  return Number(row.n);
}

describe('what a crash can cost the usage meter', () => {
  it('defaults to a write every second and after 100 calls (the bound the README states)', () => {
    const config = loadConfig({});
    expect(config.usageFlushIntervalMs).toBe(1_000);
    expect(config.usageFlushAfterCalls).toBe(100);
  });

  it('writes as soon as USAGE_FLUSH_AFTER_CALLS calls wait, without being asked', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const app = anotherInstance(t, AFTER_FIVE);
    const meter = app.locals.services.usageMeter;
    for (let i = 0; i < 4; i++) await size(app, token);
    await meter.settled();
    expect(await storedCount(org.id)).toBe(0);
    expect(meter.pendingRequests()).toBe(4);

    await size(app, token); // the fifth
    await meter.settled();
    expect(await storedCount(org.id)).toBe(5);
    expect(meter.pendingRequests()).toBe(0);
    await closeTraffic(app);
  });

  it('after a crash (an instance that never closes), loses fewer calls than the count, and the quota still counts the rest', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const crashed = anotherInstance(t, AFTER_FIVE);
    for (let i = 0; i < 12; i++) await size(crashed, token);
    await crashed.locals.services.usageMeter.settled();
    // 12 calls, writes after the 5th and the 10th: the 2 since are all a crash can take.
    expect(await storedCount(org.id)).toBe(10);

    // The next start reads the month from the database: the 10 written calls count against the
    // quota, so crashing the server does not give them back.
    const restarted = anotherInstance(t, AFTER_FIVE);
    const usage = await request(restarted).get('/v1/usage').set(bearer(token)).expect(200);
    expect(usage.body.quota.usedThisMonth).toBe(10);
    await closeTraffic(restarted);
  });
});
