import { mkdtempSync, rmSync } from 'node:fs';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { tmpdir } from 'node:os';
import path from 'node:path';
import Stripe from 'stripe';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createPaymentsClient } from '../../api/payments/client.js';
import { startFakeProvider, type FakeProvider } from '../../api/payments/fake-provider.js';
import { signPayload } from '../../api/payments/signature.js';
import { createLogger } from '../../api/logger.js';

const SECRET_KEY = 'sk_test_simulation0001';
const WEBHOOK_SECRET = 'whsec_simulation0001';
const PRICES = [
  { id: 'price_test_shop', unitAmount: 2900, currency: 'eur' },
  { id: 'price_test_partner', unitAmount: 9900, currency: 'eur' },
];

interface Received {
  raw: string;
  signature: string;
}

let dataDir: string;
let fake: FakeProvider;
let sdk: Stripe;
let receiver: Server;
let received: Received[] = [];
/** How many of the next deliveries the receiver refuses with a 500. */
let refuseNext = 0;

async function startFake() {
  const started = await startFakeProvider({ dataDir, host: '127.0.0.1', secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, logger: createLogger('silent'), retryDelayMs: 20 });
  started.setPrices(PRICES);
  started.setWebhookUrl(`http://127.0.0.1:${(receiver.address() as AddressInfo).port}/hook`);
  return started;
}

beforeAll(async () => {
  dataDir = mkdtempSync(path.join(tmpdir(), 'tw-payments-'));
  receiver = createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      received.push({ raw: Buffer.concat(chunks).toString('utf8'), signature: String(req.headers['stripe-signature']) });
      if (refuseNext > 0) {
        refuseNext -= 1;
        res.statusCode = 500;
      }
      res.end();
    });
  });
  await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
  fake = await startFake();
  sdk = createPaymentsClient({ secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, apiUrl: fake.url, simulated: true });
});

afterAll(async () => {
  await fake.close();
  receiver.closeAllConnections();
  await new Promise((r) => receiver.close(r));
  rmSync(dataDir, { recursive: true, force: true });
});

const events = () => received.map((r) => Stripe.webhooks.constructEvent(r.raw, r.signature, WEBHOOK_SECRET));

async function paidCheckout(price = 'price_test_shop') {
  const customer = await sdk.customers.create({ email: 'admin@harborlane.test', name: 'Harbor Lane Lighting', metadata: { organizationId: 'org-1' } });
  const session = await sdk.checkout.sessions.create({
    mode: 'subscription',
    customer: customer.id,
    client_reference_id: 'org-1',
    line_items: [{ price, quantity: 1 }],
    success_url: 'http://localhost:3000/billing?done=1',
    cancel_url: 'http://localhost:3000/billing',
  });
  const paid = await fetch(`${fake.url}/checkout/${session.id}/pay`, { method: 'POST', redirect: 'manual' });
  return { customer, session, paid };
}

describe('the local payment simulation, driven through the official SDK', () => {
  it('signs webhooks exactly as the SDK test helper does, and constructEvent accepts them', () => {
    const payload = JSON.stringify({ id: 'evt_1', object: 'event' });
    const timestamp = 1_790_000_000;
    expect(signPayload(payload, WEBHOOK_SECRET, timestamp)).toBe(Stripe.webhooks.generateTestHeaderString({ payload, secret: WEBHOOK_SECRET, timestamp }));
    const fresh = signPayload(payload, WEBHOOK_SECRET, Math.floor(Date.now() / 1000));
    expect(Stripe.webhooks.constructEvent(payload, fresh, WEBHOOK_SECRET).id).toBe('evt_1');
    expect(() => Stripe.webhooks.constructEvent(payload, signPayload(payload, 'whsec_another000', Math.floor(Date.now() / 1000)), WEBHOOK_SECRET)).toThrow();
    // Outside the tolerance the SDK refuses an otherwise good signature.
    expect(() => Stripe.webhooks.constructEvent(payload, signPayload(payload, WEBHOOK_SECRET, timestamp), WEBHOOK_SECRET, 300)).toThrow(/tolerance/i);
  });

  it('refuses a wrong API key as the provider would', async () => {
    const stranger = createPaymentsClient({ secretKey: 'sk_test_wrongkey0001', webhookSecret: WEBHOOK_SECRET, apiUrl: fake.url, simulated: true });
    await expect(stranger.customers.create({ email: 'x@quayside.test' })).rejects.toMatchObject({ type: 'StripeAuthenticationError' });
  });

  it('serves a checkout page that says it is a simulation, with pay and decline', async () => {
    const customer = await sdk.customers.create({ email: 'admin@kestrelfinch.test' });
    const session = await sdk.checkout.sessions.create({ mode: 'subscription', customer: customer.id, line_items: [{ price: 'price_test_partner', quantity: 1 }], cancel_url: 'http://localhost:3000/billing' });
    expect(session.url).toBe(`${fake.url}/checkout/${session.id}`);
    const html = await (await fetch(session.url!)).text();
    expect(html).toContain('Simulated payment provider');
    expect(html).toContain('99.00 EUR a month');
    expect(html).toMatch(/<button[^>]*>Pay \(simulated\)<\/button>/);
    expect(html).toMatch(/<button[^>]*>Decline \(simulated\)<\/button>/);
    const declined = await fetch(`${fake.url}/checkout/${session.id}/decline`, { method: 'POST', redirect: 'manual' });
    expect(declined.status).toBe(303);
    expect(declined.headers.get('location')).toBe('http://localhost:3000/billing');
    expect(await (await fetch(session.url!)).text()).toContain('was declined');
  });

  it('refuses an unknown price and modes other than subscription', async () => {
    const customer = await sdk.customers.create({ email: 'admin@quayside.test' });
    await expect(sdk.checkout.sessions.create({ mode: 'subscription', customer: customer.id, line_items: [{ price: 'price_nothing', quantity: 1 }] })).rejects.toMatchObject({ statusCode: 400 });
    await expect(sdk.checkout.sessions.create({ mode: 'payment', customer: customer.id, line_items: [{ price: 'price_test_shop', quantity: 1 }] })).rejects.toMatchObject({ statusCode: 400 });
  });

  it('paying creates the subscription and a paid invoice, and delivers signed checkout and invoice events', async () => {
    received = [];
    const { customer, session, paid } = await paidCheckout();
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toBe('http://localhost:3000/billing?done=1');
    await fake.drained();
    const got = events();
    expect(got.map((e) => e.type)).toEqual(['checkout.session.completed', 'invoice.paid']);
    const completed = got[0].data.object as Stripe.Checkout.Session;
    expect(completed).toMatchObject({ id: session.id, customer: customer.id, client_reference_id: 'org-1', status: 'complete' });
    const sub = await sdk.subscriptions.retrieve(completed.subscription as string);
    expect(sub).toMatchObject({ status: 'active', customer: customer.id, cancel_at_period_end: false });
    expect(sub.items.data[0].price.id).toBe('price_test_shop');
    const invoices = await sdk.invoices.list({ customer: customer.id });
    expect(invoices.data.map((i) => [i.status, i.amount_paid, i.currency])).toEqual([['paid', 2900, 'eur']]);
    const invoicePage = await (await fetch(invoices.data[0].hosted_invoice_url!)).text();
    expect(invoicePage).toContain('Simulated payment provider');
    expect(invoicePage).toContain('29.00 EUR, status: paid');
    // A session is paid once.
    expect((await fetch(`${fake.url}/checkout/${session.id}/pay`, { method: 'POST', redirect: 'manual' })).status).toBe(409);
  });

  it('changes the price in place, cancels at period end, and cancels outright, each with an event', async () => {
    received = [];
    const { session } = await paidCheckout();
    await fake.drained();
    const [sub0] = await listSubscriptionsOf(session.id);
    received = [];
    const item = sub0.items.data[0];
    const moved = await sdk.subscriptions.update(sub0.id, { items: [{ id: item.id, price: 'price_test_partner' }] });
    expect(moved.items.data[0].price.id).toBe('price_test_partner');
    expect(moved.id).toBe(sub0.id);
    const ending = await sdk.subscriptions.update(sub0.id, { cancel_at_period_end: true });
    expect(ending.cancel_at_period_end).toBe(true);
    const gone = await sdk.subscriptions.cancel(sub0.id);
    expect(gone.status).toBe('canceled');
    await fake.drained();
    expect(events().map((e) => e.type)).toEqual(['customer.subscription.updated', 'customer.subscription.updated', 'customer.subscription.deleted']);
  });

  it('retries a delivery the endpoint refused, with the same event id', async () => {
    received = [];
    refuseNext = 2;
    await paidCheckout();
    await fake.drained();
    const ids = events().map((e) => `${e.type} ${e.id}`);
    // Both events were refused once each (or the first twice) and then accepted: 4 deliveries, 2 distinct events.
    expect(ids).toHaveLength(4);
    expect(new Set(ids).size).toBe(2);
  });

  it('keeps its state in DATA_DIR: a restart loses no subscription', async () => {
    const { session } = await paidCheckout();
    await fake.drained();
    const before = await listSubscriptionsOf(session.id);
    await fake.close();
    fake = await startFake();
    sdk = createPaymentsClient({ secretKey: SECRET_KEY, webhookSecret: WEBHOOK_SECRET, apiUrl: fake.url, simulated: true });
    const again = await sdk.subscriptions.retrieve(before[0].id);
    expect(again.status).toBe('active');
  });
});

/** The subscription a paid session created (read back from the checkout event the fake delivered). */
async function listSubscriptionsOf(sessionId: string): Promise<Stripe.Subscription[]> {
  const all = received.length ? events() : [];
  const completed = all.find((e) => e.type === 'checkout.session.completed' && (e.data.object as Stripe.Checkout.Session).id === sessionId);
  if (!completed) throw new Error('no checkout event for this session');
  return [await sdk.subscriptions.retrieve((completed.data.object as Stripe.Checkout.Session).subscription as string)];
}
