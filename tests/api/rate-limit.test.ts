import { eq } from 'drizzle-orm';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { organizations } from '../../api/db/schema.js';
import { PASSWORD_RESETS_PER_IP, SIGN_IN_FAILURES_PER_IP, USER_RATE_PER_MINUTE, embedRatePerIp } from '../../api/middleware/rate-limit.js';
import { bearer, createMember, signIn, TEST_PASSWORD } from '../support/accounts.js';
import { closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { createTestApp, type TestApp } from '../support/test-app.js';

// The plans seeded by migrations/0001_accounts_keys_usage_audit.sql.
const FREE = { ratePerMinute: 60, monthlyQuota: 1000 };
const SHOP = { ratePerMinute: 600, monthlyQuota: 50000 };
const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const SHOP_ORIGIN = 'https://shop.harborlane.test';

let t: TestApp;
beforeAll(async () => {
  t = await createTestApp();
  // As behind a reverse proxy on the same host: the client address comes from X-Forwarded-For,
  // which lets one test speak from several addresses (RFC 5737 documentation ranges).
  t.app.set('trust proxy', 'loopback');
});
afterAll(async () => {
  await closeTraffic(t.app);
  await t.close();
});

const size = (token: string) => request(t.app).post('/v1/calculations/voltage-drop').set(bearer(token)).send(VOLTAGE_DROP);

/** `n` calls, a few at a time (they all count; order does not matter). */
async function times<T>(n: number, call: (i: number) => Promise<T>): Promise<T[]> {
  const out: T[] = [];
  for (let i = 0; i < n; i += 20) out.push(...(await Promise.all(Array.from({ length: Math.min(20, n - i) }, (_, j) => call(i + j)))));
  return out;
}

describe('per API key, at the plan rate', () => {
  it('sends draft-8 RateLimit and RateLimit-Policy headers, no legacy ones', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const res = await size(token).expect(200);
    // draft-ietf-httpapi-ratelimit-headers-08: `"name"; q=<quota>; w=<window s>` and `"name"; r=<remaining>; t=<reset s>` (from memory)
    expect(res.headers['ratelimit-policy']).toMatch(new RegExp(`"api-key"; q=${FREE.ratePerMinute}; w=60; pk=:[A-Za-z0-9+/=]+:`));
    expect(res.headers.ratelimit).toMatch(new RegExp(`"api-key"; r=${FREE.ratePerMinute - 1}; t=\\d+`));
    expect(res.headers['ratelimit-policy']).toContain(`"monthly-quota"; q=${FREE.monthlyQuota}; w=`);
    expect(res.headers.ratelimit).toContain(`"monthly-quota"; r=${FREE.monthlyQuota - 1}; t=`);
    expect(res.headers['x-ratelimit-limit']).toBeUndefined();
    expect(res.headers['ratelimit-limit']).toBeUndefined();
  });

  it('answers 429 rate_limited as problem+json with Retry-After past the limit; other organisations are unaffected', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id);
    const elsewhere = await createOrganization(t);
    const other = await createKey(t, elsewhere.id);
    const served = await times(FREE.ratePerMinute, () => size(token));
    expect(served.map((r) => r.status)).toEqual(new Array(FREE.ratePerMinute).fill(200));

    const refused = await size(token).expect(429);
    expect(refused.headers['content-type']).toMatch(/^application\/problem\+json/);
    const retryAfter = Number(refused.headers['retry-after']);
    expect(Number.isInteger(retryAfter)).toBe(true);
    expect(retryAfter).toBeGreaterThanOrEqual(0);
    expect(retryAfter).toBeLessThanOrEqual(60); // within the one-minute window
    expect(refused.headers.ratelimit).toMatch(/"api-key"; r=0; t=\d+/);
    expect(refused.body).toEqual({
      type: 'https://treadwise.test/problems/rate-limited',
      title: 'Too many requests',
      status: 429,
      detail: expect.stringContaining(`more than ${FREE.ratePerMinute} requests in 1 min`),
      instance: '/v1/calculations/voltage-drop',
      code: 'rate_limited',
      requestId: refused.headers['x-request-id'],
    });

    await size(other.token).expect(200);
    // The refused call is metered as limited and not billed against the month.
    const usage = await request(t.app).get('/v1/usage').set(bearer(token)).expect(429); // still limited this minute
    expect(usage.body.code).toBe('rate_limited');
  });

  it('shares the plan’s rate between all keys of one organisation', async () => {
    const org = await createOrganization(t);
    const first = await createKey(t, org.id);
    const second = await createKey(t, org.id);
    // Half the plan's rate from each key (free plan: 60 a minute, migration 0001) uses it up.
    const served = [...(await times(FREE.ratePerMinute / 2, () => size(first.token))), ...(await times(FREE.ratePerMinute / 2, () => size(second.token)))];
    expect(served.every((r) => r.status === 200)).toBe(true);
    const refused = await size(second.token).expect(429);
    expect(refused.headers.ratelimit).toMatch(/"organization"; r=0; t=\d+/);
    expect(refused.headers['ratelimit-policy']).toContain(`"organization"; q=${FREE.ratePerMinute}; w=60`);
    await size(first.token).expect(429);
  });

  it("takes the rate from the organisation's plan", async () => {
    const org = await createOrganization(t);
    await t.database.db.update(organizations).set({ planId: 'shop' }).where(eq(organizations.id, org.id));
    const { token } = await createKey(t, org.id);
    const res = await size(token).expect(200);
    expect(res.headers['ratelimit-policy']).toContain(`"api-key"; q=${SHOP.ratePerMinute}; w=60`);
    expect(res.headers['ratelimit-policy']).toContain(`"monthly-quota"; q=${SHOP.monthlyQuota}`);
  });
});

describe('embed keys, also per client IP', () => {
  it('limits each address below the key rate, so one caller cannot use up the key', async () => {
    const org = await createOrganization(t);
    const { token } = await createKey(t, org.id, { kind: 'embed', allowedOrigins: [SHOP_ORIGIN] });
    const perIp = embedRatePerIp(FREE.ratePerMinute);
    expect(perIp).toBe(10); // the floor: a tenth of 60 is 6, at least 10
    const from = (ip: string) => size(token).set('Origin', SHOP_ORIGIN).set('X-Forwarded-For', ip);

    const first = await from('198.51.100.7').expect(200);
    expect(first.headers['ratelimit-policy']).toContain(`"api-key-client-ip"; q=${perIp}; w=60`);
    expect(first.headers['ratelimit-policy']).toContain(`"api-key"; q=${FREE.ratePerMinute}; w=60`);
    await times(perIp - 1, () => from('198.51.100.7').expect(200));

    const refused = await from('198.51.100.7').expect(429);
    expect(refused.body.code).toBe('rate_limited');
    expect(refused.headers['retry-after']).toMatch(/^\d+$/);
    expect(refused.headers.ratelimit).toMatch(/"api-key-client-ip"; r=0/);

    // Another address still gets through; the refused call never reached the key's own limit.
    const elsewhere = await from('198.51.100.8').expect(200);
    expect(elsewhere.headers.ratelimit).toContain(`"api-key"; r=${FREE.ratePerMinute - perIp - 1};`);
  });
});

describe('signed-in users, per user', () => {
  it(`allows ${USER_RATE_PER_MINUTE} calls a minute per user`, async () => {
    const org = await createOrganization(t);
    const a = await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email);
    const b = await signIn(t.app, (await createMember(t.app, org.id, 'viewer')).email);
    const statuses = await times(USER_RATE_PER_MINUTE, () => request(t.app).get('/v1/auth/me').set(bearer(a.accessToken)).then((r) => r.status));
    expect(statuses.every((s) => s === 200)).toBe(true);

    const refused = await request(t.app).get('/v1/auth/me').set(bearer(a.accessToken)).expect(429);
    expect(refused.body.code).toBe('rate_limited');
    expect(refused.headers['ratelimit-policy']).toContain(`"user"; q=${USER_RATE_PER_MINUTE}; w=60`);
    await request(t.app).get('/v1/auth/me').set(bearer(b.accessToken)).expect(200);
  });
});

describe('sign-in and password reset, per client IP', () => {
  it('counts failed sign-ins only, and refuses the address past the limit', async () => {
    const org = await createOrganization(t);
    const { email } = await createMember(t.app, org.id, 'estimator');
    const signInFrom = (ip: string, body: object) => request(t.app).post('/v1/auth/sign-in').set('X-Forwarded-For', ip).send(body);
    // Unknown addresses, so no account lockout gets in the way.
    const wrong = (i: number) => ({ email: `nobody-${i}@spray.test`, password: 'not-the-password' });

    await times(SIGN_IN_FAILURES_PER_IP - 1, (i) => signInFrom('203.0.113.50', wrong(i)).expect(401));
    await signInFrom('203.0.113.50', { email, password: TEST_PASSWORD }).expect(200);
    // Had the success counted, this would be one too many.
    await signInFrom('203.0.113.50', wrong(1000)).expect(401);

    const refused = await signInFrom('203.0.113.50', wrong(1001)).expect(429);
    expect(refused.body).toMatchObject({ code: 'rate_limited', status: 429, instance: '/v1/auth/sign-in' });
    expect(refused.headers['retry-after']).toMatch(/^\d+$/);
    expect(refused.headers['ratelimit-policy']).toContain(`"sign-in-failures-ip"; q=${SIGN_IN_FAILURES_PER_IP}; w=900`);
    await signInFrom('203.0.113.51', wrong(1002)).expect(401);
  });

  it('limits password-reset requests per address', async () => {
    const resetFrom = (ip: string) => request(t.app).post('/v1/auth/password-reset').set('X-Forwarded-For', ip).send({ email: 'someone@reset.test' });
    const statuses = await times(PASSWORD_RESETS_PER_IP, () => resetFrom('203.0.113.60').then((r) => r.status));
    expect(statuses.every((s) => s === 202)).toBe(true);
    const refused = await resetFrom('203.0.113.60').expect(429);
    expect(refused.body.code).toBe('rate_limited');
    await resetFrom('203.0.113.61').expect(202);
  });
});
