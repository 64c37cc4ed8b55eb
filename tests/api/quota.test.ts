import { randomBytes } from 'node:crypto';
import { asc, eq, inArray } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations, outboxMessages, plans, quotaNotices } from '../../api/db/schema.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
// A plan made for these tests: 10 calls a month (so 80 % is the 8th call), a rate that never binds.
const TINY = { monthlyQuota: 10, ratePerMinute: 1000 };

let now = new Date('2026-11-20T10:00:00Z');
const clock = () => now;

let t: TestApp;
let planId: string;
beforeAll(async () => {
  t = await createTestApp({}, clock);
  planId = `tiny-${randomBytes(3).toString('hex')}`;
  await t.database.db.insert(plans).values({ id: planId, name: 'Tiny', ...TINY });
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
});

type App = TestApp['app'];
const size = (app: App, token: string) => request(app).post('/v1/calculations/voltage-drop').set(bearer(token)).send(VOLTAGE_DROP);

/** `n` calls one after another (the order of admission matters near the quota). */
async function calls(app: App, token: string, n: number): Promise<number[]> {
  const statuses: number[] = [];
  for (let i = 0; i < n; i++) statuses.push((await size(app, token)).status);
  return statuses;
}

async function tinyOrganization() {
  const org = await createOrganization(t);
  await t.database.db.update(organizations).set({ planId }).where(eq(organizations.id, org.id));
  const admins = [await createMember(t.app, org.id, 'admin'), await createMember(t.app, org.id, 'admin')].map((m) => m.email).sort();
  const viewer = await createMember(t.app, org.id, 'viewer');
  const { token } = await createKey(t, org.id);
  return { org, admins, viewer, token };
}

async function mailTo(addresses: string[]) {
  return t.database.db.select().from(outboxMessages).where(inArray(outboxMessages.to, addresses)).orderBy(asc(outboxMessages.to), asc(outboxMessages.subject));
}

async function noticesOf(organizationId: string) {
  const rows = await t.database.db.select().from(quotaNotices).where(eq(quotaNotices.organizationId, organizationId));
  return rows.map((r) => `${r.month} ${r.thresholdPercent}`).sort();
}

describe('the monthly quota', () => {
  it('warns the admins at 80 % and 100 % once each, then refuses with quota_exceeded until the month ends', async () => {
    now = new Date('2026-11-20T10:00:00Z');
    const { org, admins, viewer, token } = await tinyOrganization();

    expect(await calls(t.app, token, 7)).toEqual(new Array(7).fill(200));
    await t.app.locals.services.quotas.idle();
    expect(await mailTo([...admins, viewer.email])).toEqual([]);

    await size(t.app, token).expect(200); // the 8th of 10: 80 %
    await t.app.locals.services.quotas.idle();
    const at80 = await mailTo([...admins, viewer.email]);
    expect(at80.map((m) => m.to)).toEqual(admins); // admins only, one message each
    expect(at80[0].subject).toBe(`Treadwise: ${org.name} has used 80 % of its monthly quota units`);
    expect(at80[0].text).toContain('has used 8 of the 10 quota units that its Tiny plan includes for 2026-11 (80 %)');

    expect(await calls(t.app, token, 2)).toEqual([200, 200]); // the 10th: 100 %
    await t.app.locals.services.quotas.idle();
    const at100 = (await mailTo(admins)).filter((m) => m.subject.includes('has used its monthly quota units'));
    expect(at100.map((m) => m.to)).toEqual(admins);
    expect(at100[0].text).toContain('refused (HTTP 429, quota_exceeded), and running batch jobs stop, until the quota starts again on 2026-12-01');

    const refused = await size(t.app, token).expect(429);
    expect(refused.headers['content-type']).toMatch(/^application\/problem\+json/);
    // From 2026-11-20T10:00Z to 2026-12-01T00:00Z: 10 days 14 hours = 914 400 s.
    expect(refused.headers['retry-after']).toBe('914400');
    expect(refused.headers.ratelimit).toContain('"monthly-quota"; r=0; t=914400');
    expect(refused.body).toMatchObject({
      type: 'https://treadwise.test/problems/quota-exceeded',
      status: 429,
      code: 'quota_exceeded',
      instance: '/v1/calculations/voltage-drop',
      requestId: refused.headers['x-request-id'],
    });
    expect(refused.body.detail).toContain('2026-12-01T00:00:00.000Z');

    expect(await calls(t.app, token, 4)).toEqual([429, 429, 429, 429]);
    await t.app.locals.services.quotas.idle();
    expect(await mailTo(admins)).toHaveLength(4); // still two each: 80 % and 100 %
    expect(await noticesOf(org.id)).toEqual(['2026-11 100', '2026-11 80']);

    // Refused calls are metered but do not count against the quota.
    const session = await signIn(t.app, viewer.email);
    const usage = await request(t.app).get('/v1/usage').set(bearer(session.accessToken)).expect(200);
    expect(usage.body.quota).toMatchObject({ planId, monthlyQuota: 10, usedThisMonth: 10, remaining: 0, percentUsed: 100 });
    expect(usage.body.totals).toMatchObject({ requests: 15, limited: 5 });
  });

  it('starts again when the month rolls over (UTC, injected clock), with fresh warnings', async () => {
    now = new Date('2026-11-29T12:00:00Z');
    const { org, admins, token } = await tinyOrganization();
    expect(await calls(t.app, token, 11)).toEqual([...new Array(10).fill(200), 429]);
    await t.app.locals.services.quotas.idle();

    now = new Date('2026-11-30T23:59:59Z');
    const lastSecond = await size(t.app, token).expect(429);
    expect(lastSecond.headers['retry-after']).toBe('1');

    now = new Date('2026-12-01T00:00:00Z');
    const fresh = await size(t.app, token).expect(200);
    expect(fresh.headers.ratelimit).toContain('"monthly-quota"; r=9;');
    // December has 31 days: 2 678 400 s.
    expect(fresh.headers['ratelimit-policy']).toContain('"monthly-quota"; q=10; w=2678400');
    expect(await calls(t.app, token, 7)).toEqual(new Array(7).fill(200)); // 8 in December: 80 %
    await t.app.locals.services.quotas.idle();
    expect(await noticesOf(org.id)).toEqual(['2026-11 100', '2026-11 80', '2026-12 80']);
    const december = (await mailTo(admins)).filter((m) => m.text.includes('for 2026-12 (80 %)'));
    expect(december.map((m) => m.to)).toEqual(admins);
  });

  it('sends each warning once even when two instances reach it, and the instances converge on one count', async () => {
    now = new Date('2026-11-20T10:00:00Z');
    const { org, admins, token } = await tinyOrganization();
    const one = anotherInstance(t, { USAGE_FLUSH_INTERVAL_MS: '3600000' }, clock);
    const two = anotherInstance(t, { USAGE_FLUSH_INTERVAL_MS: '3600000' }, clock);

    expect(await calls(one, token, 8)).toEqual(new Array(8).fill(200)); // 80 % on instance one
    await one.locals.services.usageMeter.flush();
    await one.locals.services.quotas.idle();
    expect(await mailTo(admins)).toHaveLength(2);

    // Instance two loads 8 from the database; its 9th call also sees 80 % reached, but the
    // notice row exists already, so nobody is mailed again. Its 10th sends the 100 % warning.
    expect(await calls(two, token, 2)).toEqual([200, 200]);
    await two.locals.services.quotas.idle();
    expect(await noticesOf(org.id)).toEqual(['2026-11 100', '2026-11 80']);
    expect(await mailTo(admins)).toHaveLength(4);
    expect(await calls(two, token, 1)).toEqual([429]);

    // Instance one has not heard of those two calls yet: it admits up to its own view of 10 …
    expect(await calls(one, token, 2)).toEqual([200, 200]);
    await one.locals.services.quotas.idle();
    expect(await mailTo(admins)).toHaveLength(4); // … and its 100 % notice is not sent twice.
    // After the next flush both instances know the 12 calls served.
    await two.locals.services.usageMeter.flush();
    await one.locals.services.usageMeter.flush();
    expect(await calls(one, token, 1)).toEqual([429]);
    expect((await one.locals.services.quotas.standing(org.id)).used).toBe(12);

    await closeTraffic(one);
    await closeTraffic(two);
  });
});

describe('sizing from the console', () => {
  it('counts against the same quota as keys, is metered as "console", and stops when the quota is spent', async () => {
    now = new Date('2026-11-21T10:00:00Z');
    const { org, token } = await tinyOrganization();
    const estimator = await createMember(t.app, org.id, 'estimator');
    const user = (await signIn(t.app, estimator.email)).accessToken;
    expect(await calls(t.app, token, 6)).toEqual([200, 200, 200, 200, 200, 200]);
    const fromConsole = await calls(t.app, user, 5);
    // 10 calls a month (the tiny plan above): the user's 5th call is the 11th of the month.
    expect(fromConsole).toEqual([200, 200, 200, 200, 429]);
    const refused = await size(t.app, user).expect(429);
    expect(refused.body.code).toBe('quota_exceeded');
    await size(t.app, token).expect(429);
    // Account routes of the console are not metered and keep working.
    await request(t.app).get('/v1/members').set(bearer(user)).expect(200);
    await t.app.locals.services.usageMeter.flush();
    const usage = await request(t.app).get('/v1/usage?from=2026-11-21&to=2026-11-21').set(bearer(user)).expect(200);
    expect(usage.body.totals.byKey).toContainEqual(expect.objectContaining({ keyId: 'console', requests: 6, limited: 2 }));
  });
});
