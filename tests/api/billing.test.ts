import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { eq } from 'drizzle-orm';
import { pino } from 'pino';
import Stripe from 'stripe';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app.js';
import { ephemeralSecrets } from '../../api/auth/secrets.js';
import { loadConfig } from '../../api/config.js';
import type { Database } from '../../api/db/client.js';
import { billingAccounts, billingEvents, organizations, outboxMessages } from '../../api/db/schema.js';
import { createLogger } from '../../api/logger.js';
import { startFakeProvider, type FakeProvider } from '../../api/payments/fake-provider.js';
import { signPayload } from '../../api/payments/signature.js';
import { providerPrices } from '../../api/services/plans.js';
import { bearer, createMember, signIn } from '../support/accounts.js';
import { closeTraffic } from '../support/app-instance.js';
import { createKey, createOrganization } from '../support/fixtures.js';
import { QUIET_METER, type TestApp } from '../support/test-app.js';
import { createTestDatabase } from '../support/test-database.js';

const SECRET_KEY = 'sk_test_billingtests01';
const WEBHOOK_SECRET = 'whsec_billingtests01';
const VOLTAGE_DROP = { supplyVoltageV: 24, currentA: 2, lengthM: 10, conductor: { crossSectionMm2: 0.75 } };

let dataDir: string;
let fake: FakeProvider;
let database: Database;
let t: TestApp;
let server: Server;
/** What the app logged at warn and above. */
const logged: string[] = [];

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(tmpdir(), 'tw-billing-'));
  fake = await startFakeProvider({ dataDir, host: '127.0.0.1', secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, logger: createLogger('silent'), retryDelayMs: 20 });
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', CONSOLE_DIR: '/nonexistent', ...QUIET_METER });
  database = await createTestDatabase();
  const secrets = ephemeralSecrets();
  const logger = pino({ level: 'warn' }, { write: (line: string) => void logged.push(line) });
  const app = createApp({ config, database, logger, secrets, clock: () => new Date(), payments: { secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, apiUrl: fake.url, simulated: true } });
  t = { app, database, config, secrets, close: () => database.close() };
  fake.setPrices(await providerPrices(database.db));
  server = createServer(app);
  await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
  fake.setWebhookUrl(`http://127.0.0.1:${(server.address() as AddressInfo).port}/v1/billing/webhook`);
});

afterAll(async () => {
  await fake.close();
  server.closeAllConnections();
  await new Promise((r) => server.close(r));
  await closeTraffic(t.app);
  await t.close();
  rmSync(dataDir, { recursive: true, force: true });
});

async function shop() {
  const org = await createOrganization(t);
  const admin = await createMember(t.app, org.id, 'admin');
  const viewer = await createMember(t.app, org.id, 'viewer');
  const { token } = await createKey(t, org.id);
  return { org, adminEmail: admin.email, admin: (await signIn(t.app, admin.email)).accessToken, viewer: (await signIn(t.app, viewer.email)).accessToken, key: token };
}

const planOf = async (id: string) => (await database.db.select({ planId: organizations.planId }).from(organizations).where(eq(organizations.id, id)))[0].planId;
const pay = (url: string) => fetch(`${url}/pay`, { method: 'POST', redirect: 'manual' });

/** A webhook as the provider would post it, signed with `secret`. */
const post = (event: object, secret = WEBHOOK_SECRET) => {
  const payload = JSON.stringify(event);
  return request(t.app).post('/v1/billing/webhook').set('content-type', 'application/json').set('stripe-signature', signPayload(payload, secret, Math.floor(Date.now() / 1000))).send(payload);
};

describe('billing', () => {
  it('upgrades end to end: checkout, pay on the simulation, webhook, plan applied, higher rate limit in force', async () => {
    const s = await shop();
    const before = await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(s.key)).send(VOLTAGE_DROP);
    expect(before.headers['ratelimit-policy']).toContain('"api-key"; q=60;');

    const overview = await request(t.app).get('/v1/billing').set(bearer(s.viewer));
    expect(overview.status).toBe(200);
    expect(overview.body).toMatchObject({ plan: { id: 'free' }, state: 'free', subscription: null, simulated: true });
    expect(overview.body.plans.map((p: { id: string; price: unknown }) => [p.id, p.price])).toEqual([
      ['free', null],
      ['shop', { monthlyMinor: 2900, currency: 'eur' }],
      ['partner', { monthlyMinor: 9900, currency: 'eur' }],
    ]);

    const checkout = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'partner' });
    expect(checkout.status).toBe(200);
    expect(checkout.body.outcome).toBe('checkout');
    expect(checkout.body.url).toMatch(new RegExp(`^${fake.url}/checkout/cs_`));
    expect(await planOf(s.org.id)).toBe('free'); // nothing changes before the provider confirms payment

    expect((await pay(checkout.body.url)).status).toBe(303);
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('partner');

    const after = await request(t.app).post('/v1/calculations/voltage-drop').set(bearer(s.key)).send(VOLTAGE_DROP);
    expect(after.headers['ratelimit-policy']).toContain('"api-key"; q=3000;');
    const now = await request(t.app).get('/v1/billing').set(bearer(s.admin));
    expect(now.body).toMatchObject({ plan: { id: 'partner' }, state: 'active', subscription: { status: 'active', cancelAtPeriodEnd: false }, usage: { monthlyQuota: 500000 } });
    const invoices = await request(t.app).get('/v1/billing/invoices').set(bearer(s.admin));
    expect(invoices.body.items.map((i: { status: string; amountPaid: number; currency: string }) => [i.status, i.amountPaid, i.currency])).toEqual([['paid', 9900, 'eur']]);
  });

  it('changes the subscription in place for another paid plan, and cancels at the period end', async () => {
    const s = await shop();
    const first = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop' });
    await pay(first.body.url);
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('shop');
    const subscriptionBefore = (await request(t.app).get('/v1/billing').set(bearer(s.admin))).body.subscription;

    const moved = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'partner' });
    expect(moved.body).toEqual({ outcome: 'changed', url: null });
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('partner');
    expect((await request(t.app).get('/v1/billing').set(bearer(s.admin))).body.subscription.currentPeriodEnd).toBe(subscriptionBefore.currentPeriodEnd);

    expect((await request(t.app).post('/v1/billing/cancel').set(bearer(s.admin))).status).toBe(204);
    await fake.drained();
    const ending = await request(t.app).get('/v1/billing').set(bearer(s.admin));
    expect(ending.body).toMatchObject({ plan: { id: 'partner' }, state: 'ending', subscription: { cancelAtPeriodEnd: true } });
  });

  it('handles a duplicate event once, and takes the state from the subscription, not the arrival order', async () => {
    const s = await shop();
    const checkout = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop' });
    await pay(checkout.body.url);
    await fake.drained();
    const [account] = await database.db.select().from(billingAccounts).where(eq(billingAccounts.organizationId, s.org.id));
    const subscriptionId = account.subscriptionId;
    expect(subscriptionId).toMatch(/^sub_/);

    // An old "updated" event naming the shop price arrives after the subscription moved to partner and then ended.
    const sdk = new Stripe(SECRET_KEY, { host: '127.0.0.1', port: fake.port, protocol: 'http' });
    const current = await sdk.subscriptions.retrieve(subscriptionId!);
    await sdk.subscriptions.cancel(subscriptionId!);
    await fake.drained();
    expect(await planOf(s.org.id)).toBe('free');
    const stale = { id: 'evt_stale_update_1', object: 'event', type: 'customer.subscription.updated', created: current.created, data: { object: current } };
    const first = await post(stale);
    expect(first.body).toEqual({ received: true, duplicate: false });
    expect(await planOf(s.org.id)).toBe('free');
    const again = await post(stale);
    expect(again.status).toBe(200);
    expect(again.body).toEqual({ received: true, duplicate: true });
    expect(await database.db.select().from(billingEvents).where(eq(billingEvents.eventId, 'evt_stale_update_1'))).toHaveLength(1);
  });

  it('a failed renewal e-mails the admins and shows past_due, keeping the paid plan while the provider retries', async () => {
    const s = await shop();
    const checkout = await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop' });
    await pay(checkout.body.url);
    await fake.drained();
    const [account] = await database.db.select().from(billingAccounts).where(eq(billingAccounts.organizationId, s.org.id));
    const failed = await fetch(`${fake.url}/simulation/subscriptions/${account.subscriptionId}/fail-renewal`, { method: 'POST' });
    expect(failed.status).toBe(200);
    await fake.drained();
    const mail = await database.db.select().from(outboxMessages).where(eq(outboxMessages.to, s.adminEmail));
    expect(mail.map((m) => m.subject)).toEqual(['Treadwise: a payment for your plan failed']);
    expect(mail[0].text).toContain('29.00 EUR');
    const overview = await request(t.app).get('/v1/billing').set(bearer(s.admin));
    expect(overview.body).toMatchObject({ plan: { id: 'shop' }, state: 'past_due', subscription: { status: 'past_due' } });
    const invoices = await request(t.app).get('/v1/billing/invoices').set(bearer(s.admin));
    expect(invoices.body.items.map((i: { status: string }) => i.status)).toEqual(['open', 'paid']);
  });

  it('refuses a forged signature with 400 and records nothing', async () => {
    const forged = await post({ id: 'evt_forged_1', object: 'event', type: 'checkout.session.completed', data: { object: {} } }, 'whsec_someoneelse01');
    expect(forged.status).toBe(400);
    expect(forged.headers['content-type']).toMatch(/^application\/problem\+json/);
    expect(forged.body).toMatchObject({ status: 400, title: 'Bad signature' });
    const unsigned = await request(t.app).post('/v1/billing/webhook').set('content-type', 'application/json').send('{"id":"evt_unsigned"}');
    expect(unsigned.status).toBe(400);
    expect(await database.db.select().from(billingEvents).where(eq(billingEvents.eventId, 'evt_forged_1'))).toHaveLength(0);
    // Logged, without the payload.
    expect(logged.some((l) => l.includes('bad signature refused'))).toBe(true);
    expect(logged.some((l) => l.includes('evt_forged_1') || l.includes('evt_unsigned'))).toBe(false);
  });

  it('lets only admins pay, change or cancel; keys reach no billing route; the free plan needs no checkout', async () => {
    const s = await shop();
    expect((await request(t.app).post('/v1/billing/checkout').set(bearer(s.viewer)).send({ planId: 'shop' })).status).toBe(403);
    expect((await request(t.app).get('/v1/billing/invoices').set(bearer(s.viewer))).status).toBe(403);
    expect((await request(t.app).get('/v1/billing').set(bearer(s.key))).status).toBe(403);
    expect((await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'free' })).status).toBe(409);
    expect((await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'platform' })).status).toBe(404);
    expect((await request(t.app).post('/v1/billing/checkout').set(bearer(s.admin)).send({ planId: 'shop', extra: 1 })).status).toBe(400);
    expect((await request(t.app).post('/v1/billing/cancel').set(bearer(s.admin))).status).toBe(409);
  });
});
