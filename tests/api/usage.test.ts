import { eq, sql } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { apiKeys, usageCounters } from '../../api/db/schema.js';
import { LATENCY_BOUNDS_MS, bucketIndex, estimatePercentile } from '../../api/services/latency-histogram.js';
import { usageReportSchema } from '../../shared/schemas/usage.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const CABLE = { supplyVoltageV: 24, currentA: 2, lengthM: 10 };
const VOLTAGE_ROUTE = 'POST /v1/calculations/voltage-drop';
const CABLE_ROUTE = 'POST /v1/calculations/cable';
const SHOP_ORIGIN = 'https://shop.harborlane.test';

let now = new Date('2026-12-01T10:00:00Z');
const clock = () => now;

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp({}, clock);
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
});

type App = TestApp['app'];
const size = (app: App, token: string) => request(app).post('/v1/calculations/voltage-drop').set(bearer(token)).send(VOLTAGE_DROP);
const usage = (app: App, token: string, query = '') => request(app).get(`/v1/usage${query}`).set(bearer(token));

async function storedCount(organizationId: string): Promise<number> {
  const [row] = await t.database.db
    .select({ n: sql<string>`coalesce(sum(${usageCounters.count}), 0)` })
    .from(usageCounters)
    .where(eq(usageCounters.organizationId, organizationId));
  return Number(row.n);
}

describe('latency percentiles from fixed buckets', () => {
  // Linear interpolation inside the bucket holding the rank, as histogram quantiles are usually
  // estimated (common practice, no published source).
  it('puts a latency in the first bucket whose bound it does not exceed', () => {
    expect(LATENCY_BOUNDS_MS).toEqual([5, 10, 25, 50, 100, 250, 500, 1000, 2500]);
    expect([0, 5, 5.01, 10, 2500, 2500.5].map(bucketIndex)).toEqual([0, 0, 1, 1, 8, 9]);
  });

  it('interpolates inside the bucket and has nothing to say without data', () => {
    const tenIn5to10 = [0, 10, 0, 0, 0, 0, 0, 0, 0, 0];
    expect(estimatePercentile(tenIn5to10, 50)).toBe(7.5); // 5 + 5/10 × (10 − 5)
    expect(estimatePercentile(tenIn5to10, 95)).toBe(9.8); // 5 + 9.5/10 × 5 = 9.75, one decimal
    expect(estimatePercentile([4, 0, 0, 0, 0, 0, 0, 0, 0, 4], 50)).toBe(5); // rank 4 ends the first bucket
    expect(estimatePercentile([4, 0, 0, 0, 0, 0, 0, 0, 0, 4], 95)).toBe(2500); // open bucket: its lower bound
    expect(estimatePercentile(new Array(10).fill(0), 50)).toBeNull();
  });
});

describe('metering', () => {
  it('counts N concurrent calls exactly once each, and writes nothing until asked', async () => {
    const org = await createOrganization(t);
    const { token, key } = await createKey(t, org.id);
    const n = 40; // fewer than the free plan's 60 per minute (migrations/0001)
    const results = await Promise.all(Array.from({ length: n }, () => size(t.app, token)));
    expect(results.every((r) => r.status === 200)).toBe(true);
    expect(await storedCount(org.id)).toBe(0); // the hot path does no writes

    const res = await usage(t.app, token).expect(200);
    usageReportSchema.parse(res.body);
    expect(res.body.totals).toMatchObject({ requests: n, limited: 0, byStatusClass: { '2xx': n, '3xx': 0, '4xx': 0, '5xx': 0 } });
    expect(res.body.totals.byRoute).toEqual([expect.objectContaining({ route: VOLTAGE_ROUTE, requests: n })]);
    expect(res.body.totals.byKey).toEqual([{ keyId: key.keyId, requests: n, limited: 0, units: n }]);
    expect(res.body.data.at(-1)).toMatchObject({ day: '2026-12-01', requests: n });
    expect(res.body.totals.p50LatencyMs).not.toBeNull();
    expect(res.body.totals.p95LatencyMs).toBeGreaterThanOrEqual(res.body.totals.p50LatencyMs);
    expect(await storedCount(org.id)).toBe(n);

    const [row] = await t.database.db.select({ lastUsedAt: apiKeys.lastUsedAt }).from(apiKeys).where(eq(apiKeys.id, key.id));
    expect(row.lastUsedAt?.toISOString()).toBe(now.toISOString());
  });

  it('keeps every count across a graceful restart (two instances on one database, in turn)', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    // A flush interval of an hour: only close() can have written the counts.
    const first = anotherInstance(t, { USAGE_FLUSH_INTERVAL_MS: '3600000' }, clock);
    const firstBatch = 25;
    await Promise.all(Array.from({ length: firstBatch }, () => size(first, token).expect(200)));
    expect(await storedCount(org.id)).toBe(0);
    await closeTraffic(first); // what server.close() does before the database closes
    expect(await storedCount(org.id)).toBe(firstBatch);

    const second = anotherInstance(t, { USAGE_FLUSH_INTERVAL_MS: '3600000' }, clock);
    const seen = await usage(second, token).expect(200);
    expect(seen.body.totals.requests).toBe(firstBatch);
    expect(seen.body.quota.usedThisMonth).toBe(firstBatch);
    const secondBatch = 10;
    await Promise.all(Array.from({ length: secondBatch }, () => size(second, token).expect(200)));
    await closeTraffic(second);
    expect(await storedCount(org.id)).toBe(firstBatch + 1 + secondBatch); // + the usage call itself
  });

  it('groups by status class and by route', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    await size(t.app, token).expect(200);
    await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(token)).send({ supplyVoltageV: -1 }).expect(400);
    await request(t.app).post('/v1/calculations/cable').set(bearer(token)).send(CABLE).expect(200);

    const res = await usage(t.app, token).expect(200);
    const today = res.body.data.at(-1);
    expect(today.byStatusClass).toEqual({ '2xx': 2, '3xx': 0, '4xx': 1, '5xx': 0 });
    expect(today.byRoute.map((r: { route: string; requests: number }) => [r.route, r.requests])).toEqual([
      [VOLTAGE_ROUTE, 2],
      [CABLE_ROUTE, 1],
    ]);
  });

  it('counts each call on the UTC day of the injected clock', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    now = new Date('2026-11-30T23:59:59Z');
    await Promise.all([1, 2, 3].map(() => size(t.app, token).expect(200)));
    now = new Date('2026-12-01T00:00:01Z');
    await Promise.all([1, 2].map(() => size(t.app, token).expect(200)));

    const res = await usage(t.app, token, '?from=2026-11-29&to=2026-12-01').expect(200);
    expect(res.body.data.map((d: { day: string; requests: number }) => [d.day, d.requests])).toEqual([
      ['2026-11-29', 0],
      ['2026-11-30', 3],
      ['2026-12-01', 2],
    ]);
    expect(res.body.quota).toMatchObject({ month: '2026-12', usedThisMonth: 2, resetsAt: '2027-01-01T00:00:00.000Z' });
    now = new Date('2026-12-01T10:00:00Z');
  });
});

describe('GET /v1/usage', () => {
  it('covers the last 30 days by default, every day listed', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const res = await usage(t.app, token).expect(200);
    expect(res.body).toMatchObject({ from: '2026-11-02', to: '2026-12-01', filters: { keyId: null, route: null } });
    expect(res.body.data).toHaveLength(30);
    expect(res.body.data[0]).toEqual({
      day: '2026-11-02',
      requests: 0,
      limited: 0,
      units: 0,
      byStatusClass: { '2xx': 0, '3xx': 0, '4xx': 0, '5xx': 0 },
      meanLatencyMs: null,
      p50LatencyMs: null,
      p95LatencyMs: null,
      byRoute: [],
    });
    // The free plan of migrations/0001: 1000 calls a month, 60 a minute.
    expect(res.body.quota).toEqual({
      planId: 'free',
      planName: 'Free',
      monthlyQuota: 1000,
      ratePerMinute: 60,
      month: '2026-12',
      usedThisMonth: 0,
      remaining: 1000,
      percentUsed: 0,
      resetsAt: '2027-01-01T00:00:00.000Z',
    });
  });

  it('filters by key and by route', async () => {
    const org = await createOrganization(t);
    const one = await createKey(t, org.id);
    const two = await createKey(t, org.id);
    await Promise.all([1, 2, 3].map(() => size(t.app, one.token).expect(200)));
    await Promise.all([1, 2].map(() => request(t.app).post('/v1/calculations/cable').set(bearer(two.token)).send(CABLE).expect(200)));

    const byKey = await usage(t.app, one.token, `?keyId=${two.key.keyId}`).expect(200);
    expect(byKey.body.filters).toEqual({ keyId: two.key.keyId, route: null });
    expect(byKey.body.totals).toMatchObject({ requests: 2, byKey: [{ keyId: two.key.keyId, requests: 2, limited: 0, units: 2 }] });

    const byRoute = await usage(t.app, one.token, `?route=${encodeURIComponent(VOLTAGE_ROUTE)}`).expect(200);
    expect(byRoute.body.totals.requests).toBe(3);
    expect(byRoute.body.totals.byRoute.map((r: { route: string }) => r.route)).toEqual([VOLTAGE_ROUTE]);

    // The two usage queries above were made with key one: they count too (GET /v1/usage).
    const all = await usage(t.app, one.token).expect(200);
    expect(all.body.totals.byKey).toEqual([
      { keyId: one.key.keyId, requests: 5, limited: 0, units: 5 },
      { keyId: two.key.keyId, requests: 2, limited: 0, units: 2 },
    ]);
    expect(all.body.totals.byRoute.map((r: { route: string; requests: number }) => [r.route, r.requests])).toEqual([
      [VOLTAGE_ROUTE, 3],
      ['GET /v1/usage', 2], // ties in route-name order
      [CABLE_ROUTE, 2],
    ]);
    expect(all.body.quota).toMatchObject({ usedThisMonth: 7, remaining: 993, percentUsed: 0.7 });
  });

  it('refuses a malformed filter, a reversed range and a range over 366 days', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const reversed = await usage(t.app, token, '?from=2026-12-01&to=2026-11-01').expect(400);
    expect(reversed.body).toMatchObject({ code: 'validation_failed', errors: [{ path: 'from' }] });
    const tooLong = await usage(t.app, token, '?from=2025-11-30&to=2026-12-01').expect(400);
    expect(tooLong.body.errors[0].path).toBe('from');
    await usage(t.app, token, '?from=2025-12-01&to=2026-12-01').expect(200); // 366 days, the most
    const badKey = await usage(t.app, token, '?keyId=not-a-key').expect(400);
    expect(badKey.body.errors[0].path).toBe('keyId');
    const badDate = await usage(t.app, token, '?from=2026-02-30').expect(400);
    expect(badDate.body.errors[0].path).toBe('from');
  });

  it("never shows another organisation's calls, even when asked for its key", async () => {
    const a = await createOrganization(t);
    const b = await createOrganization(t);
    const aKey = await createKey(t, a.id);
    const bKey = await createKey(t, b.id);
    await size(t.app, aKey.token).expect(200);
    const res = await usage(t.app, bKey.token, `?keyId=${aKey.key.keyId}`).expect(200);
    expect(res.body.totals).toMatchObject({ requests: 0, byKey: [] });
    expect(res.body.quota.usedThisMonth).toBe(0);
  });

  it('is open to viewers and to keys with usage:read, not to embed keys or keys without the scope', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    await size(t.app, token).expect(200);
    const viewer = await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email);
    const seen = await request(t.app).get('/v1/usage').set(bearer(viewer.accessToken)).expect(200);
    expect(seen.body.totals.requests).toBe(1);

    const sizingOnly = await createKey(t, org.id, { scopes: ['sizing:run'] });
    expect((await usage(t.app, sizingOnly.token).expect(403)).body.code).toBe('insufficient_scope');
    const pub = await createKey(t, org.id, { kind: 'embed', allowedOrigins: [SHOP_ORIGIN] });
    await usage(t.app, pub.token).set('Origin', SHOP_ORIGIN).expect(403);
  });
});

describe('GET /v1/usage/export', () => {
  it('answers CSV, one row per day × key × route × status class, as an attachment', async () => {
    const org = await createOrganization(t, `export-${Date.now().toString(36)}`);
    const one = await createKey(t, org.id);
    const two = await createKey(t, org.id);
    await Promise.all([1, 2, 3].map(() => size(t.app, one.token).expect(200)));
    await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(one.token)).send({}).expect(400);
    await Promise.all([1, 2].map(() => request(t.app).post('/v1/calculations/cable').set(bearer(two.token)).send(CABLE).expect(200)));

    const res = await request(t.app).get('/v1/usage/export?from=2026-11-28&to=2026-12-01').set(bearer(one.token)).expect(200);
    expect(res.headers['content-type']).toBe('text/csv; charset=utf-8');
    expect(res.headers['content-disposition']).toBe(`attachment; filename="treadwise-usage-${org.slug}-2026-11-28-to-2026-12-01.csv"`);
    const [header, ...lines] = res.text.trimEnd().split('\r\n');
    const columns = header.split(',');
    expect(columns.slice(0, 10)).toEqual(['day', 'key_id', 'route', 'status_class', 'requests', 'limited', 'units', 'latency_ms_total', 'p50_latency_ms', 'p95_latency_ms']);
    expect(columns.slice(10)).toEqual(['le_5ms', 'le_10ms', 'le_25ms', 'le_50ms', 'le_100ms', 'le_250ms', 'le_500ms', 'le_1000ms', 'le_2500ms', 'gt_2500ms']);

    const rows = lines.map((line) => Object.fromEntries(line.split(',').map((v, i) => [columns[i], v])));
    const summary = rows.map((r) => [r.day, r.key_id, r.route, r.status_class, Number(r.requests)]);
    // single calls: one quota unit each, refused-by-validation calls included (only limits refuse units)
    for (const r of rows) expect(Number(r.units)).toBe(Number(r.requests) - Number(r.limited));
    expect(summary).toEqual(
      [
        ['2026-12-01', one.key.keyId, VOLTAGE_ROUTE, '2xx', 3],
        ['2026-12-01', one.key.keyId, VOLTAGE_ROUTE, '4xx', 1],
        ['2026-12-01', two.key.keyId, CABLE_ROUTE, '2xx', 2],
      ].sort((x, y) => String(x[1]).localeCompare(String(y[1])) || String(x[2]).localeCompare(String(y[2])) || String(x[3]).localeCompare(String(y[3]))),
    );
    for (const r of rows) {
      const inBuckets = columns.slice(10).reduce((sum, c) => sum + Number(r[c]), 0);
      expect(inBuckets).toBe(Number(r.requests));
    }
  });
});
