import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { and, eq } from 'drizzle-orm';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app.js';
import { ephemeralSecrets } from '../../api/auth/secrets.js';
import { loadConfig } from '../../api/config.js';
import type { Database } from '../../api/db/client.js';
import { billingAccounts, organizations, outboxMessages, overageReports, usageCounters } from '../../api/db/schema.js';
import { createLogger } from '../../api/logger.js';
import { startFakeProvider, type FakeProvider } from '../../api/payments/fake-provider.js';
import { signPayload } from '../../api/payments/signature.js';
import { overageByDay } from '../../api/services/billing-overage.js';
import { providerPrices } from '../../api/services/plans.js';
import { alderRowTownhouse } from '../../shared/schemas/estimate-examples.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { anotherInstance, closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { QUIET_METER, type TestApp } from '../support/test-app.js';
import { createTestDatabase } from '../support/test-database.js';

const SECRET_KEY = 'sk_test_billinglifecycle01';
const WEBHOOK_SECRET = 'whsec_billinglifecycle01';
const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };
const DAY_MS = 24 * 3600 * 1000;

/** The API's clock: real time plus an offset the tests move forward (the simulation keeps real time, so signatures stay fresh). */
let offsetMs = 0;
const clock = () => new Date(Date.now() + offsetMs);

let dataDir: string;
let fake: FakeProvider;
let database: Database;
let t: TestApp;
let server: Server;
let sdk: Stripe;

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(tmpdir(), 'tw-billing-life-'));
  fake = await startFakeProvider({ dataDir, host: '127.0.0.1', secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, logger: createLogger('silent'), retryDelayMs: 20 });
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', CONSOLE_DIR: '/nonexistent', ...QUIET_METER });
  database = await createTestDatabase();
  const secrets = ephemeralSecrets();
  const app = createApp({ config, database, logger: createLogger('silent'), secrets, clock, payments: { secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, apiUrl: fake.url, simulated: true } });
  t = { app, database, config, secrets, close: () => database.close() };
  fake.setPrices(await providerPrices(database.db));
  server = createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  fake.setWebhookUrl(`http://127.0.0.1:${(server.address() as AddressInfo).port}/v1/billing/webhook`);
  sdk = new Stripe(SECRET_KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http' });
});

afterAll(async () => {
  await fake.close();
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
  await t.app.locals.services.batchJobs.close();
  await closeTraffic(t.app);
  await t.close();
  rmSync(dataDir, { recursive: true, force: true });
});

const billing = () => t.app.locals.services.billing!;
const planOf = async (id: string) => (await database.db.select({ planId: organizations.planId }).from(organizations).where(eq(organizations.id, id)))[0].planId;
const accountOf = async (id: string) => (await database.db.select().from(billingAccounts).where(eq(billingAccounts.organizationId, id)))[0];
const simulate = async (subscriptionId: string, action: 'fail-renewal' | 'advance-period' | 'pay-open-invoices') => {
  const res = await fetch(`${fake.url}/simulation/subscriptions/${subscriptionId}/${action}`, { method: 'POST' });
  expect(res.status).toBe(200);
  await fake.drained();
};

async function shop() {
  const org = await createOrganization(t);
  const admin = await createMember(t.app, org.id, 'admin');
  const { token } = await createKey(t, org.id, { scopes: ['sizing:run', 'batches:write'] });
  return { org, adminEmail: admin.email, admin: (await signIn(t.app, admin.email)).accessToken, key: token, relogin: async () => (await signIn(t.app, admin.email)).accessToken };
}

/** An organisation subscribed to `planId` through the simulated checkout. */
async function subscribed(planId: 'shop' | 'partner') {
  const s = await shop();
  const checkout = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId }).expect(200);
  expect((await fetch(`${checkout.body.url}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(303);
  await fake.drained();
  expect(await planOf(s.org.id)).toBe(planId);
  return { ...s, subscriptionId: (await accountOf(s.org.id)).subscriptionId! };
}

const rateQuota = async (app: TestApp['app'], key: string) => (await request(app).post('/v1/calculations/voltage-drop').set(bearer(key)).send(VOLTAGE_DROP)).headers['ratelimit-policy'];
const invoices = async (admin: string) => (await request(t.app).get('/v1/billing/invoices').set(bearer(admin)).expect(200)).body.items as { status: string; amountDue: number; amountPaid: number }[];

describe('plan changes', () => {
  it('reach another instance at once, although it has the old plan cached', async () => {
    const other = anotherInstance(t, {}, clock);
    await other.locals.services.keyEvents.listening;
    const s = await shop();
    expect(await rateQuota(other, s.key)).toContain('q=60;'); // the free plan, cached on the other instance now
    const checkout = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'partner' }).expect(200);
    await fetch(`${checkout.body.url}/pay`, { method: 'POST', redirect: 'manual' });
    await fake.drained();
    // The plan cache keeps a plan 60 s; only the plan: notification makes the other instance load it sooner.
    await expect.poll(() => rateQuota(other, s.key), { timeout: 3000, interval: 50 }).toContain('q=3000;');
    await closeTraffic(other);
  });

  it('upgrades at once with the rest of the period invoiced, prorated, on the same subscription', async () => {
    const s = await subscribed('shop');
    const moved = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'partner' }).expect(200);
    expect(moved.body).toEqual({ outcome: 'changed', url: null });
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('partner');
    expect((await accountOf(s.org.id)).subscriptionId).toBe(s.subscriptionId);
    expect(await rateQuota(t.app, s.key)).toContain('q=3000;');
    const [proration, first] = await invoices(s.admin);
    // 99 − 29 EUR for (almost all of) a month that has just begun.
    expect(proration.status).toBe('paid');
    expect(proration.amountPaid).toBeGreaterThan(6900);
    expect(proration.amountPaid).toBeLessThanOrEqual(7000);
    expect(first.amountPaid).toBe(2900);
  });

  it('downgrades at the period end: the partner plan stays until then, the renewal bills and applies the shop plan', async () => {
    const s = await subscribed('partner');
    const scheduled = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop' }).expect(200);
    expect(scheduled.body).toEqual({ outcome: 'scheduled', url: null });
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('partner');
    const overview = await request(t.app).get('/v1/billing').set(bearer(s.admin)).expect(200);
    expect(overview.body).toMatchObject({ plan: { id: 'partner' }, state: 'active', subscription: { scheduledPlanId: 'shop' } });
    expect(await invoices(s.admin)).toHaveLength(1); // no proration for a downgrade

    await simulate(s.subscriptionId, 'advance-period');
    expect(await planOf(s.org.id)).toBe('shop');
    expect((await invoices(s.admin)).map((i) => [i.status, i.amountPaid])).toEqual([
      ['paid', 2900],
      ['paid', 9900],
    ]);
    expect((await request(t.app).get('/v1/billing').set(bearer(s.admin))).body.subscription.scheduledPlanId).toBeNull();

    // Cancelled: the shop plan stays to the period end, then the organisation is on free.
    await request(t.app).post('/v1/billing/cancel').set(bearer(s.admin)).expect(204);
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('shop');
    await simulate(s.subscriptionId, 'advance-period');
    expect(await planOf(s.org.id)).toBe('free');
    expect((await request(t.app).get('/v1/billing').set(bearer(s.admin))).body).toMatchObject({ state: 'free', subscription: { status: 'canceled' } });
  });

  it('a scheduled downgrade is dropped by choosing the plan paid for again', async () => {
    const s = await subscribed('partner');
    await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop' }).expect(200);
    const back = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'partner' }).expect(200);
    expect(back.body.outcome).toBe('changed');
    await fake.drained();
    await simulate(s.subscriptionId, 'advance-period');
    expect(await planOf(s.org.id)).toBe('partner');
    expect((await invoices(s.admin)).map((i) => i.amountPaid)).toEqual([9900, 9900]);
  });
});

describe('the simulation', () => {
  it('keeps create_prorations lines for the next renewal invoice instead of invoicing them at once', async () => {
    const s = await subscribed('shop');
    const sub = await sdk.subscriptions.retrieve(s.subscriptionId);
    await sdk.subscriptions.update(s.subscriptionId, { items: [{ id: sub.items.data[0].id, price: 'price_treadwise_partner_monthly' }], proration_behavior: 'create_prorations' });
    await fake.drained();
    expect(await invoices(s.admin)).toHaveLength(1);
    await simulate(s.subscriptionId, 'advance-period');
    const [renewal] = await invoices(s.admin);
    // 99 EUR for the new period plus 99 − 29 EUR for (almost all of) the one before.
    expect(renewal.amountPaid).toBeGreaterThan(9900 + 6900);
    expect(renewal.amountPaid).toBeLessThanOrEqual(9900 + 7000);
  });
});

describe('a failed payment', () => {
  it('e-mails the fall-back date, keeps the plan during the grace, falls back to free after it, and comes back when paid', async () => {
    const s = await subscribed('shop');
    await simulate(s.subscriptionId, 'fail-renewal');
    const since = (await accountOf(s.org.id)).pastDueSince!;
    expect(since).toBeInstanceOf(Date);
    const ends = new Date(since.getTime() + 7 * DAY_MS); // the shop plan's grace (migration 0015)
    const [mail] = await database.db.select().from(outboxMessages).where(eq(outboxMessages.to, s.adminEmail));
    expect(mail.text).toContain(ends.toISOString().slice(0, 10));
    expect(mail.text).toContain('falls back to the free plan');
    const overview = await request(t.app).get('/v1/billing').set(bearer(s.admin)).expect(200);
    expect(overview.body).toMatchObject({ plan: { id: 'shop' }, state: 'past_due', graceEndsAt: ends.toISOString() });

    // A retry that fails again keeps the first failure's date.
    await simulate(s.subscriptionId, 'fail-renewal');
    expect((await accountOf(s.org.id)).pastDueSince).toEqual(since);

    offsetMs += 6 * DAY_MS;
    await billing().maintain();
    expect(await planOf(s.org.id)).toBe('shop');
    offsetMs += DAY_MS + 60_000;
    await billing().maintain();
    await billing().maintain(); // a second pass (or instance) changes nothing more
    expect(await planOf(s.org.id)).toBe('free');
    const after = await request(t.app).get('/v1/billing').set(bearer(await s.relogin())).expect(200);
    expect(after.body).toMatchObject({ plan: { id: 'free' }, state: 'past_due', graceEndsAt: ends.toISOString() });
    expect(await rateQuota(t.app, s.key)).toContain('q=60;');

    await simulate(s.subscriptionId, 'pay-open-invoices');
    expect(await planOf(s.org.id)).toBe('shop');
    expect((await accountOf(s.org.id)).pastDueSince).toBeNull();
    expect((await request(t.app).get('/v1/billing').set(bearer(await s.relogin()))).body).toMatchObject({ plan: { id: 'shop' }, state: 'active', graceEndsAt: null });
    offsetMs = 0;
  });

  it('is put right by the admin on the payment-details page: the unpaid invoice is paid with a new card and the grace ends', async () => {
    const s = await subscribed('shop');
    await simulate(s.subscriptionId, 'fail-renewal');
    expect((await accountOf(s.org.id)).pastDueSince).toBeInstanceOf(Date);

    const link = await request(t.app).post('/v1/billing/payment-details').set(bearer(s.admin)).expect(200);
    expect(link.body.url).toMatch(new RegExp(`^${fake.url}/portal/`));
    const page = await (await fetch(link.body.url)).text();
    expect(page).toContain('no real payment takes place');
    expect(page).toMatch(/Unpaid: SIM-\d+ \(29\.00 EUR\)/);
    expect(page).toContain('Treadwise Shop plan: past_due');

    const saved = await fetch(`${link.body.url}/card`, { method: 'POST', redirect: 'manual' });
    expect(saved.status).toBe(303);
    expect(saved.headers.get('location')).toBe(`${t.config.publicUrl}/billing`);
    await fake.drained();
    expect((await accountOf(s.org.id)).pastDueSince).toBeNull();
    const overview = await request(t.app).get('/v1/billing').set(bearer(s.admin)).expect(200);
    expect(overview.body).toMatchObject({ plan: { id: 'shop' }, state: 'active', graceEndsAt: null });
    expect((await invoices(s.admin)).map((i) => i.status)).toEqual(['paid', 'paid']);
  });

  it('has no payment-details page for an organisation that never paid', async () => {
    const s = await shop();
    const refused = await request(t.app).post('/v1/billing/payment-details').set(bearer(s.admin)).expect(409);
    expect(refused.body.code).toBe('no_billing_account');
  });

  it('a failure event arriving after the payment went through starts no grace and sends no e-mail', async () => {
    const s = await subscribed('shop');
    const customer = (await accountOf(s.org.id)).customerId;
    const late = { id: 'evt_late_failure_1', object: 'event', type: 'invoice.payment_failed', created: Math.floor(Date.now() / 1000) - 600, data: { object: { id: 'in_late_1', object: 'invoice', customer, amount_due: 2900, currency: 'eur' } } };
    const payload = JSON.stringify(late);
    await request(t.app).post('/v1/billing/webhook').set('content-type', 'application/json').set('stripe-signature', signPayload(payload, WEBHOOK_SECRET, Math.floor(Date.now() / 1000))).send(payload).expect(200);
    expect((await accountOf(s.org.id)).pastDueSince).toBeNull();
    expect(await planOf(s.org.id)).toBe('shop');
    expect(await database.db.select().from(outboxMessages).where(eq(outboxMessages.to, s.adminEmail))).toHaveLength(0);
  });

  it('falls back on reading the overview too, before the sweep runs', async () => {
    const s = await subscribed('shop');
    await simulate(s.subscriptionId, 'fail-renewal');
    offsetMs += 8 * DAY_MS;
    const overview = await request(t.app).get('/v1/billing').set(bearer(await s.relogin())).expect(200);
    expect(overview.body.plan.id).toBe('free');
    offsetMs = 0;
  });
});

describe('overage', () => {
  it('splits the month over the quota by day', () => {
    const days = [
      { day: '2026-11-03', units: 600 },
      { day: '2026-11-01', units: 300 },
      { day: '2026-11-04', units: 250 },
      { day: '2026-12-01', units: 1200 },
    ];
    expect([...overageByDay(days, 1000)]).toEqual([
      ['2026-11-04', 150],
      ['2026-12-01', 200],
    ]);
  });

  /** Two consecutive finished days of one month, a few days back (the provider takes events up to 35 days old). */
  const twoDays = () => {
    for (let back = 3; ; back += 1) {
      const d1 = new Date(Date.now() - back * DAY_MS).toISOString().slice(0, 10);
      const d2 = new Date(Date.now() - (back - 1) * DAY_MS).toISOString().slice(0, 10);
      if (d1.slice(0, 7) === d2.slice(0, 7)) return [d1, d2];
    }
  };
  const used = (organizationId: string, day: string, units: number) =>
    database.db.insert(usageCounters).values({ organizationId, keyId: 'seeded', day, route: 'POST /v1/estimates', statusClass: '2xx', count: units, units, latencyMsTotal: 0, latencyBuckets: [] });

  it('the simulation keeps the first meter event of an identifier and refuses one for an unknown customer', async () => {
    const s = await subscribed('partner');
    const customer = (await accountOf(s.org.id)).customerId;
    const event = { event_name: 'treadwise_units', identifier: `probe:${s.org.id}`, timestamp: Math.floor(Date.now() / 1000) - 60 };
    await sdk.billing.meterEvents.create({ ...event, payload: { stripe_customer_id: customer, value: '5' } });
    const again = await sdk.billing.meterEvents.create({ ...event, payload: { stripe_customer_id: customer, value: '9' } });
    expect(again.payload.value).toBe('5');
    expect(fake.meterEvents().filter((e) => e.identifier === event.identifier)).toHaveLength(1);
    await expect(sdk.billing.meterEvents.create({ ...event, identifier: 'probe:nobody', payload: { stripe_customer_id: 'cus_nobody', value: '1' } })).rejects.toThrow(/customer/);
  });

  it('lets a partner organisation past its quota go on (calls and batch jobs) while the shop plan refuses', async () => {
    const today = clock().toISOString().slice(0, 10);
    const partner = await subscribed('partner');
    await used(partner.org.id, today, 500_000);
    const ok = await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(partner.key)).send(VOLTAGE_DROP);
    expect(ok.status).toBe(200);
    const job = await request(t.app).post('/v1/batches').set(bearer(partner.key)).send({ items: [{ request: alderRowTownhouse }, { request: alderRowTownhouse }] }).expect(202);
    await t.app.locals.services.batchJobs.drain();
    const done = await request(t.app).get(`/v1/batches/${job.body.id}`).set(bearer(partner.admin)).expect(200);
    expect(done.body).toMatchObject({ status: 'succeeded', rows: { total: 2, done: 2 } });
    const overview = await request(t.app).get('/v1/billing').set(bearer(partner.admin)).expect(200);
    expect(overview.body.usage.overage).toBeGreaterThan(0);
    expect(overview.body.plans.find((p: { id: string }) => p.id === 'partner')).toMatchObject({ overage: { per1000Minor: 40 }, graceDays: 7 });
    await t.app.locals.services.quotas.idle();
    const notice = (await database.db.select().from(outboxMessages).where(eq(outboxMessages.to, partner.adminEmail))).find((m) => m.subject.includes('has used its monthly quota'));
    expect(notice?.text).toContain('billed as overage');

    const small = await shop();
    await database.db.update(organizations).set({ planId: 'shop' }).where(eq(organizations.id, small.org.id));
    t.app.locals.services.plans.invalidate(small.org.id);
    await used(small.org.id, today, 50_000);
    const refused = await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(small.key)).send(VOLTAGE_DROP);
    expect(refused.status).toBe(429);
    expect(refused.body.code).toBe('quota_exceeded');
  });

  it('reports each finished day once per organisation, also after a run is repeated or crashed half-way, and the renewal bills it', async () => {
    const [d1, d2] = twoDays();
    const a = await subscribed('partner');
    await used(a.org.id, d1, 499_000);
    await used(a.org.id, d2, 3_500); // 2 500 beyond the 500 000 of the partner plan
    // B crashed after the provider call, before reported_at; C after writing its row, before the call.
    const b = await subscribed('partner');
    await used(b.org.id, d2, 500_100);
    await database.db.insert(overageReports).values({ organizationId: b.org.id, day: d2, units: 100, identifier: `${b.org.id}:${d2}` });
    const bCustomer = (await accountOf(b.org.id)).customerId;
    await sdk.billing.meterEvents.create({ event_name: 'treadwise_units', payload: { stripe_customer_id: bCustomer, value: '100' }, identifier: `${b.org.id}:${d2}`, timestamp: Math.floor(Date.now() / 1000) - 3 * 86400 });
    const c = await subscribed('partner');
    await used(c.org.id, d2, 500_007);
    await database.db.insert(overageReports).values({ organizationId: c.org.id, day: d2, units: 7, identifier: `${c.org.id}:${d2}` });
    // A shop organisation over its quota has no overage to report.
    const s = await subscribed('shop');
    await used(s.org.id, d2, 60_000);

    await billing().maintain();
    await billing().maintain();

    const events = fake.meterEvents().filter((e) => [a, b, c, s].some((o) => e.identifier.startsWith(o.org.id)));
    expect(events.map((e) => [e.identifier, e.event_name, e.payload.value]).sort()).toEqual(
      [
        [`${a.org.id}:${d2}`, 'treadwise_units', '2500'],
        [`${b.org.id}:${d2}`, 'treadwise_units', '100'],
        [`${c.org.id}:${d2}`, 'treadwise_units', '7'],
      ].sort(),
    );
    expect(events.find((e) => e.identifier.startsWith(a.org.id))?.payload.stripe_customer_id).toBe((await accountOf(a.org.id)).customerId);
    const rows = await database.db.select().from(overageReports).where(and(eq(overageReports.day, d2), eq(overageReports.organizationId, a.org.id)));
    expect(rows).toHaveLength(1);
    expect(rows[0].reportedAt).toBeInstanceOf(Date);
    for (const o of [b, c]) {
      const [row] = await database.db.select().from(overageReports).where(eq(overageReports.organizationId, o.org.id));
      expect(row.reportedAt).toBeInstanceOf(Date);
    }

    // The renewal invoice bills the period's overage: 2 500 units at 0.40 EUR per 1 000.
    await simulate(a.subscriptionId, 'advance-period');
    const [renewal] = await invoices(a.admin);
    expect(renewal).toMatchObject({ status: 'paid', amountPaid: 9900 + 100 });
  });
});
