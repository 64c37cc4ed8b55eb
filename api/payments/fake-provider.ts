import { randomBytes } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type Request, type Response } from 'express';
import type { Logger } from 'pino';
import { fakeStateFile, type FakeEvent, type FakeInvoice, type FakeInvoiceLine, type FakeMeterEvent, type FakePortalSession, type FakeState, type FakeSubscription } from './fake-state.js';
import { signPayload } from './signature.js';

/** A price the fake can bill: the plans table supplies them (id, amount in minor units, currency). */
export interface FakePrice {
  id: string;
  /** What the hosted pages call it (the provider's product name). */
  name?: string;
  unitAmount: number;
  currency: string;
  /** The meter whose events this price bills beyond the plan (per 1 000 units), if any. */
  meter?: { eventName: string; per1000Minor: number };
}

export interface FakeProviderOptions {
  dataDir: string;
  host: string;
  /** 0: any free port. */
  port?: number;
  /** The key the API's SDK sends; any other is refused as the provider would. */
  secretKey: string;
  /** Webhooks are signed with this, as the provider signs with an endpoint's secret. */
  webhookSecret: string;
  logger: Logger;
  /** First retry delay after a non-2xx; doubled per attempt. */
  retryDelayMs?: number;
  /** Deliveries of one event before it is given up (and logged). */
  maxAttempts?: number;
  clock?: () => Date;
}

export interface FakeProvider {
  /** Where the SDK connects (host, port, protocol options). */
  host: string;
  port: number;
  url: string;
  setPrices(prices: FakePrice[]): void;
  /** Where events go; until set, they wait (and survive a restart). */
  setWebhookUrl(url: string): void;
  /** The meter events received (tests read what was reported). */
  meterEvents(): FakeMeterEvent[];
  /** Resolves once no event waits for delivery (tests; a shutdown does not need it). */
  drained(): Promise<void>;
  close(): Promise<void>;
}

const MONTH_SECONDS = 30 * 24 * 3600;
const API_VERSION = 'simulated';
const BANNER = 'Simulated payment provider: no real payment takes place and no card is charged.';

/**
 * A local stand-in for the payment provider, so billing runs and is tested offline. It answers
 * only the calls the API makes through the SDK (customers, checkout sessions in subscription
 * mode, subscriptions, invoices, meter events), serves a plain checkout page with pay and decline buttons, and
 * delivers signed webhooks with retries. Its state lives in DATA_DIR, written atomically.
 */
export async function startFakeProvider(options: FakeProviderOptions): Promise<FakeProvider> {
  const clock = options.clock ?? (() => new Date());
  const now = () => Math.floor(clock().getTime() / 1000);
  const store = fakeStateFile(options.dataDir);
  const state: FakeState = store.load();
  const retryDelayMs = options.retryDelayMs ?? 1000;
  const maxAttempts = options.maxAttempts ?? 8;
  let prices = new Map<string, FakePrice>();
  let webhookUrl: string | undefined;
  let baseUrl = '';
  let closed = false;
  let delivering: Promise<void> | undefined;
  let retryTimer: NodeJS.Timeout | undefined;

  const id = (prefix: string) => `${prefix}_sim${(++state.seq).toString(36).padStart(6, '0')}${randomBytes(6).toString('hex')}`;
  const save = () => store.save(state);

  const emit = (type: string, object: unknown) => {
    const event: FakeEvent = { id: id('evt'), object: 'event', type, created: now(), api_version: API_VERSION, livemode: false, data: { object: structuredClone(object) } };
    state.pending.push({ event, attempts: 0 });
  };

  /** One delivery pass at a time; failed events wait for the next pass (exponential back-off). */
  const deliver = (): Promise<void> => {
    if (delivering) return delivering;
    const pass = (async () => {
      await Promise.resolve(); // so `delivering` is set before the pass can end
      try {
        let failedDelay: number | undefined;
        for (const entry of [...state.pending]) {
          if (closed || !webhookUrl) return;
          const payload = JSON.stringify(entry.event);
          let ok = false;
          try {
            const res = await fetch(webhookUrl, {
              method: 'POST',
              headers: { 'content-type': 'application/json', 'stripe-signature': signPayload(payload, options.webhookSecret, now()) },
              body: payload,
            });
            ok = res.ok;
            await res.arrayBuffer();
          } catch {
            ok = false;
          }
          entry.attempts += 1;
          if (ok || entry.attempts >= maxAttempts) {
            if (!ok) options.logger.warn({ event: entry.event.id, type: entry.event.type }, 'simulated payments: webhook given up after retries');
            state.pending.splice(state.pending.indexOf(entry), 1);
          } else {
            failedDelay = Math.min(failedDelay ?? Infinity, retryDelayMs * 2 ** (entry.attempts - 1));
          }
          save();
        }
        if (failedDelay !== undefined && !closed) {
          clearTimeout(retryTimer);
          retryTimer = setTimeout(() => void deliver(), failedDelay);
          retryTimer.unref();
        }
      } finally {
        delivering = undefined; // one pass at a time: this is the one
      }
    })();
    delivering = pass;
    return pass;
  };

  /** A customer's meter events before `before` not yet on an invoice. */
  const unbilledEvents = (customer: string, before: number) =>
    Object.values(state.meterEvents).filter((e) => e.payload.stripe_customer_id === customer && e.invoiced === null && e.timestamp < before);

  const changed = () => {
    save();
    void deliver();
  };

  const app = express();
  app.disable('x-powered-by');
  // The SDK posts form-encoded bodies with bracketed keys (items[0][price]); extended parsing reads them.
  app.use(express.urlencoded({ extended: true, limit: '64kb' }));

  const refuse = (res: Response, status: number, message: string, type = 'invalid_request_error') => res.status(status).json({ error: { type, message } });
  const api = express.Router();
  api.use((req, res, next) => {
    if (req.headers.authorization !== `Bearer ${options.secretKey}`) return void refuse(res, 401, 'Invalid API key provided (simulation).', 'authentication_error');
    next();
  });
  const body = (req: Request) => (req.body ?? {}) as Record<string, unknown>;
  const text = (v: unknown) => (typeof v === 'string' ? v : undefined);
  const record = (v: unknown) => (v && typeof v === 'object' ? Object.fromEntries(Object.entries(v).filter(([, x]) => typeof x === 'string')) : {}) as Record<string, string>;

  api.post('/customers', (req, res) => {
    const b = body(req);
    const customer = { id: id('cus'), object: 'customer' as const, email: text(b.email) ?? null, name: text(b.name) ?? null, metadata: record(b.metadata), created: now() };
    state.customers[customer.id] = customer;
    changed();
    res.json(customer);
  });

  api.post('/checkout/sessions', (req, res) => {
    const b = body(req);
    if (b.mode !== 'subscription') return void refuse(res, 400, 'Only mode=subscription is simulated.');
    const customer = text(b.customer);
    if (!customer || !state.customers[customer]) return void refuse(res, 400, 'No such customer.');
    const items = Array.isArray(b.line_items) ? (b.line_items as Record<string, unknown>[]) : [];
    const price = text(items[0]?.price);
    if (items.length !== 1 || !price || !prices.has(price)) return void refuse(res, 400, `No such price: ${String(price ?? '(none)').slice(0, 60)}`);
    const sessionId = id('cs');
    const session = {
      id: sessionId,
      object: 'checkout.session' as const,
      mode: 'subscription' as const,
      status: 'open' as const,
      payment_status: 'unpaid' as const,
      customer,
      client_reference_id: text(b.client_reference_id) ?? null,
      metadata: record(b.metadata),
      subscription: null,
      success_url: text(b.success_url) ?? null,
      cancel_url: text(b.cancel_url) ?? null,
      url: `${baseUrl}/checkout/${sessionId}`,
      price,
      declined: false,
      created: now(),
    };
    state.sessions[sessionId] = session;
    changed();
    res.json(session);
  });

  const subscriptionOr404 = (req: Request, res: Response): FakeSubscription | undefined => {
    const sub = state.subscriptions[String(req.params.id)];
    if (!sub) refuse(res, 404, 'No such subscription.');
    return sub;
  };

  api.get('/subscriptions/:id', (req, res) => {
    const sub = subscriptionOr404(req, res);
    if (sub) res.json(sub);
  });

  api.post('/subscriptions/:id', (req, res) => {
    const sub = subscriptionOr404(req, res);
    if (!sub) return;
    if (sub.status === 'canceled') return void refuse(res, 400, 'This subscription is canceled.');
    const b = body(req);
    const items = Array.isArray(b.items) ? (b.items as Record<string, unknown>[]) : [];
    const price = text(items[0]?.price);
    let proration: FakeInvoice | undefined;
    if (price !== undefined) {
      const known = prices.get(price);
      if (!known) return void refuse(res, 400, 'No such price.');
      const item = sub.items.data[0];
      const behavior = text(b.proration_behavior) ?? 'create_prorations';
      // The unused rest of the period: credited at the old price, charged at the new one.
      const rest = Math.max(0, item.current_period_end - now()) / Math.max(1, item.current_period_end - item.current_period_start);
      const amount = Math.round((known.unitAmount - item.price.unit_amount) * rest);
      if (behavior !== 'none' && amount !== 0 && known.id !== item.price.id) {
        const line = { id: id('il'), object: 'line_item' as const, description: `Rest of the period: ${item.price.id} to ${known.id} (prorated)`, amount, currency: known.currency, proration: true };
        if (behavior === 'always_invoice' && amount > 0) proration = invoiceWith(sub, 'paid', [line]);
        else sub.pending_lines = [...(sub.pending_lines ?? []), line];
      }
      item.price = { id: known.id, object: 'price', unit_amount: known.unitAmount, currency: known.currency };
    }
    if (b.cancel_at_period_end === 'true' || b.cancel_at_period_end === 'false') sub.cancel_at_period_end = b.cancel_at_period_end === 'true';
    if (b.metadata) {
      // As the provider does: an empty value removes the key.
      const merged = { ...sub.metadata, ...record(b.metadata) };
      sub.metadata = Object.fromEntries(Object.entries(merged).filter(([, v]) => v !== ''));
    }
    emit('customer.subscription.updated', sub);
    if (proration) emit('invoice.paid', proration);
    changed();
    res.json(sub);
  });

  api.delete('/subscriptions/:id', (req, res) => {
    const sub = subscriptionOr404(req, res);
    if (!sub) return;
    if (sub.status !== 'canceled') {
      sub.status = 'canceled';
      sub.canceled_at = now();
      emit('customer.subscription.deleted', sub);
      changed();
    }
    res.json(sub);
  });

  api.get('/invoices', (req, res) => {
    const customer = text(req.query.customer);
    const limit = Math.min(Math.max(Number(req.query.limit ?? 10) || 10, 1), 100);
    const all = Object.values(state.invoices)
      .filter((i) => !customer || i.customer === customer)
      .sort((a, b) => b.created - a.created || b.id.localeCompare(a.id));
    // The page address follows this start's port (the simulation listens on a free one each time).
    const data = all.slice(0, limit).map((i) => ({ ...i, hosted_invoice_url: `${baseUrl}/invoices/${i.id}` }));
    res.json({ object: 'list', url: '/v1/invoices', has_more: all.length > limit, data });
  });
  api.post('/billing/meter_events', (req, res) => {
    const b = body(req);
    const payload = record(b.payload);
    const eventName = text(b.event_name);
    const identifier = text(b.identifier) ?? id('mev');
    const timestamp = Number(text(b.timestamp) ?? now());
    if (!eventName) return void refuse(res, 400, 'Missing event_name.');
    if (!payload.stripe_customer_id || !state.customers[payload.stripe_customer_id]) return void refuse(res, 400, 'No such customer in payload.stripe_customer_id.');
    if (!/^\d{1,12}$/.test(payload.value ?? '')) return void refuse(res, 400, 'payload.value must be a whole number.');
    if (!Number.isInteger(timestamp) || timestamp < now() - 35 * 24 * 3600 || timestamp > now() + 300) return void refuse(res, 400, 'timestamp must be within the past 35 days.');
    // A second event with an identifier already seen is dropped: the first one stands.
    const seen = state.meterEvents[identifier];
    if (seen) return void res.json(seen);
    const event: FakeMeterEvent = { object: 'billing.meter_event', event_name: eventName, identifier, payload, timestamp, created: now(), livemode: false, invoiced: null };
    state.meterEvents[identifier] = event;
    changed();
    res.json(event);
  });
  api.post('/billing_portal/sessions', (req, res) => {
    const b = body(req);
    const customer = text(b.customer);
    if (!customer || !state.customers[customer]) return void refuse(res, 400, 'No such customer.');
    const sessionId = id('bps');
    const session: FakePortalSession = { id: sessionId, object: 'billing_portal.session', customer, return_url: text(b.return_url) ?? null, url: `${baseUrl}/portal/${sessionId}`, created: now(), livemode: false };
    state.portalSessions[sessionId] = session;
    changed();
    res.json(session);
  });
  api.use((_req, res) => void refuse(res, 404, 'This call is not simulated.'));
  app.use('/v1', api);

  /** An invoice of the subscription's price for its current period, with any extra lines. */
  const invoiceFor = (sub: FakeSubscription, status: FakeInvoice['status'], extra: FakeInvoiceLine[] = []): FakeInvoice => {
    const item = sub.items.data[0];
    const base: FakeInvoiceLine = { id: id('il'), object: 'line_item', description: `Subscription ${item.price.id}`, amount: item.price.unit_amount, currency: item.price.currency, proration: false };
    return invoiceWith(sub, status, [base, ...extra]);
  };

  const invoiceWith = (sub: FakeSubscription, status: FakeInvoice['status'], lines: FakeInvoiceLine[]): FakeInvoice => {
    const item = sub.items.data[0];
    const total = Math.max(0, lines.reduce((sum, l) => sum + l.amount, 0));
    const invoice: FakeInvoice = {
      id: id('in'),
      object: 'invoice',
      customer: sub.customer,
      subscription: sub.id,
      status,
      amount_due: total,
      amount_paid: status === 'paid' ? total : 0,
      currency: item.price.currency,
      created: now(),
      period_start: item.current_period_start,
      period_end: item.current_period_end,
      hosted_invoice_url: '',
      number: `SIM-${String(Object.keys(state.invoices).length + 1).padStart(5, '0')}`,
      lines: { object: 'list', data: lines },
    };
    invoice.hosted_invoice_url = `${baseUrl}/invoices/${invoice.id}`;
    state.invoices[invoice.id] = invoice;
    return invoice;
  };

  // The hosted pages: plain HTML, each saying it is a simulation.
  const page = (res: Response, title: string, inner: string, status = 200) =>
    res
      .status(status)
      .setHeader('Cache-Control', 'no-store')
      .setHeader('Content-Security-Policy', "default-src 'none'; style-src 'unsafe-inline'; form-action 'self' http: https:")
      .type('html')
      .send(
        `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>${escape(title)} (simulation)</title>` +
          `<style>body{font-family:sans-serif;max-width:32rem;margin:3rem auto;padding:0 1rem}.sim{background:#fff3cd;padding:.75rem;border:1px solid #d4b106}button{font-size:1rem;margin-right:1rem;padding:.5rem 1.25rem}</style></head>` +
          `<body><p class="sim" role="note">${BANNER}</p><h1>${escape(title)}</h1>${inner}</body></html>`,
      );

  app.get('/checkout/:id', (req, res) => {
    const session = state.sessions[String(req.params.id)];
    if (!session) return void page(res, 'Checkout not found', '<p>This checkout does not exist.</p>', 404);
    if (session.status !== 'open') return void page(res, 'Checkout finished', '<p>This checkout is already paid.</p>');
    const price = prices.get(session.price);
    const amount = price ? `${(price.unitAmount / 100).toFixed(2)} ${price.currency.toUpperCase()} a month` : 'unknown price';
    const declined = session.declined ? '<p role="alert">The simulated payment was declined. Try again or go back.</p>' : '';
    page(
      res,
      'Subscribe',
      `${declined}<p>Subscription: <strong>${escape(price?.name ?? session.price)}</strong>, ${escape(amount)}.</p>` +
        `<form method="post" action="/checkout/${escape(session.id)}/pay" style="display:inline"><button type="submit">Pay (simulated)</button></form>` +
        `<form method="post" action="/checkout/${escape(session.id)}/decline" style="display:inline"><button type="submit">Decline (simulated)</button></form>`,
    );
  });

  app.post('/checkout/:id/pay', (req, res) => {
    const session = state.sessions[String(req.params.id)];
    if (!session || session.status !== 'open') return void page(res, 'Checkout not open', '<p>This checkout cannot be paid.</p>', 409);
    const price = prices.get(session.price);
    if (!price) return void page(res, 'Price withdrawn', '<p>This price is no longer sold.</p>', 409);
    const start = now();
    const sub: FakeSubscription = {
      id: id('sub'),
      object: 'subscription',
      customer: session.customer,
      status: 'active',
      cancel_at_period_end: false,
      canceled_at: null,
      metadata: session.metadata,
      created: start,
      items: { object: 'list', data: [{ id: id('si'), object: 'subscription_item', price: { id: price.id, object: 'price', unit_amount: price.unitAmount, currency: price.currency }, current_period_start: start, current_period_end: start + MONTH_SECONDS }] },
    };
    state.subscriptions[sub.id] = sub;
    Object.assign(session, { status: 'complete', payment_status: 'paid', subscription: sub.id });
    const invoice = invoiceFor(sub, 'paid');
    emit('checkout.session.completed', session);
    emit('invoice.paid', invoice);
    changed();
    if (session.success_url) return void res.redirect(303, session.success_url.replace('{CHECKOUT_SESSION_ID}', session.id));
    page(res, 'Paid', '<p>The simulated payment went through. You may close this page.</p>');
  });

  app.post('/checkout/:id/decline', (req, res) => {
    const session = state.sessions[String(req.params.id)];
    if (!session || session.status !== 'open') return void page(res, 'Checkout not open', '<p>This checkout cannot be paid.</p>', 409);
    session.declined = true;
    save();
    if (session.cancel_url) return void res.redirect(303, session.cancel_url);
    res.redirect(303, `/checkout/${session.id}`);
  });

  app.get('/invoices/:id', (req, res) => {
    const invoice = state.invoices[String(req.params.id)];
    if (!invoice) return void page(res, 'Invoice not found', '<p>This invoice does not exist.</p>', 404);
    const customer = state.customers[invoice.customer];
    const day = (s: number) => new Date(s * 1000).toISOString().slice(0, 10);
    page(
      res,
      `Invoice ${invoice.number}`,
      `<p>To: ${escape(customer?.name ?? customer?.email ?? invoice.customer)}</p>` +
        `<p>Period: ${day(invoice.period_start)} to ${day(invoice.period_end)}</p>` +
        `<ul>${(invoice.lines?.data ?? []).map((l) => `<li>${escape(l.description)}: ${(l.amount / 100).toFixed(2)} ${escape(l.currency.toUpperCase())}</li>`).join('')}</ul>` +
        `<p>Amount: ${(invoice.amount_due / 100).toFixed(2)} ${escape(invoice.currency.toUpperCase())}, status: ${escape(invoice.status)}</p>`,
    );
  });

  // A renewal that fails, on demand: there is no calendar in the simulation.
  app.post('/simulation/subscriptions/:id/fail-renewal', (req, res) => {
    const sub = state.subscriptions[String(req.params.id)];
    if (!sub || sub.status === 'canceled') return void res.status(404).json({ error: 'no such active subscription' });
    sub.status = 'past_due';
    const invoice = invoiceFor(sub, 'open');
    emit('invoice.payment_failed', invoice);
    emit('customer.subscription.updated', sub);
    changed();
    res.json({ subscription: sub.id, invoice: invoice.id });
  });

  // The end of the current period, on demand: a subscription set to cancel ends; any other renews
  // (paid), its invoice carrying the pending prorations and the metered overage of the period.
  app.post('/simulation/subscriptions/:id/advance-period', (req, res) => {
    const sub = state.subscriptions[String(req.params.id)];
    if (!sub || sub.status === 'canceled') return void res.status(404).json({ error: 'no such active subscription' });
    const item = sub.items.data[0];
    if (sub.cancel_at_period_end) {
      sub.status = 'canceled';
      sub.canceled_at = item.current_period_end;
      emit('customer.subscription.deleted', sub);
      changed();
      return void res.json({ subscription: sub.id, status: sub.status, invoice: null });
    }
    const ended = item.current_period_end;
    const overage: FakeInvoiceLine[] = [];
    const unitsByMeter = new Map<string, number>();
    for (const e of unbilledEvents(sub.customer, ended)) unitsByMeter.set(e.event_name, (unitsByMeter.get(e.event_name) ?? 0) + Number(e.payload.value));
    for (const [eventName, units] of unitsByMeter) {
      const meter = [...prices.values()].find((p) => p.meter?.eventName === eventName)?.meter;
      if (!meter || units === 0) continue;
      overage.push({ id: id('il'), object: 'line_item', description: `Usage beyond the plan: ${units} units (${eventName})`, amount: Math.round((units * meter.per1000Minor) / 1000), currency: item.price.currency, proration: false });
    }
    item.current_period_start = ended;
    item.current_period_end = ended + MONTH_SECONDS;
    const invoice = invoiceFor(sub, 'paid', [...(sub.pending_lines ?? []), ...overage]);
    for (const e of unbilledEvents(sub.customer, ended)) e.invoiced = invoice.id;
    sub.pending_lines = [];
    sub.status = 'active';
    emit('invoice.paid', invoice);
    emit('customer.subscription.updated', sub);
    changed();
    res.json({ subscription: sub.id, status: sub.status, invoice: invoice.id });
  });

  /** A retried payment that goes through: the open invoices are paid, the subscription is active again. */
  const payOpenInvoices = (sub: FakeSubscription): FakeInvoice[] => {
    const open = openInvoicesOf(sub.id);
    for (const invoice of open) {
      Object.assign(invoice, { status: 'paid', amount_paid: invoice.amount_due });
      emit('invoice.paid', invoice);
    }
    sub.status = 'active';
    emit('customer.subscription.updated', sub);
    changed();
    return open;
  };
  const openInvoicesOf = (subscriptionId: string) => Object.values(state.invoices).filter((i) => i.subscription === subscriptionId && i.status === 'open');

  app.post('/simulation/subscriptions/:id/pay-open-invoices', (req, res) => {
    const sub = state.subscriptions[String(req.params.id)];
    if (!sub || sub.status === 'canceled') return void res.status(404).json({ error: 'no such active subscription' });
    res.json({ subscription: sub.id, paid: payOpenInvoices(sub).map((i) => i.id) });
  });

  // The hosted payment-details page: a new (simulated) card, with which any unpaid invoice is paid.
  const PORTAL_TTL_SECONDS = 3600;
  const portalOr404 = (req: Request, res: Response): FakePortalSession | undefined => {
    const session = state.portalSessions[String(req.params.id)];
    if (!session || now() - session.created > PORTAL_TTL_SECONDS) {
      page(res, 'Link expired', '<p>This payment-details link has expired or does not exist. Open it again from your billing page.</p>', 404);
      return undefined;
    }
    return session;
  };
  const liveSubscriptionsOf = (customer: string) => Object.values(state.subscriptions).filter((s) => s.customer === customer && s.status !== 'canceled');

  app.get('/portal/:id', (req, res) => {
    const session = portalOr404(req, res);
    if (!session) return;
    const money = (minor: number, currency: string) => `${(minor / 100).toFixed(2)} ${escape(currency.toUpperCase())}`;
    const subs = liveSubscriptionsOf(session.customer);
    const open = subs.flatMap((s) => openInvoicesOf(s.id));
    const rows = subs.map((s) => `<li>${escape(prices.get(s.items.data[0].price.id)?.name ?? s.items.data[0].price.id)}: ${escape(s.status)}</li>`).join('');
    const unpaid = open.length
      ? `<p role="alert">Unpaid: ${open.map((i) => `${escape(i.number)} (${money(i.amount_due, i.currency)})`).join(', ')}.</p>`
      : '<p>Nothing is unpaid.</p>';
    const back = session.return_url ? `<p><a href="${escape(session.return_url)}">Back without changes</a></p>` : '';
    page(
      res,
      'Payment details',
      `<ul>${rows || '<li>No subscription.</li>'}</ul>${unpaid}` +
        `<form method="post" action="/portal/${escape(session.id)}/card"><button type="submit">Use a new card${open.length ? ' and pay now' : ''} (simulated)</button></form>${back}`,
    );
  });

  app.post('/portal/:id/card', (req, res) => {
    const session = portalOr404(req, res);
    if (!session) return;
    for (const sub of liveSubscriptionsOf(session.customer)) {
      if (sub.status !== 'active' || openInvoicesOf(sub.id).length) payOpenInvoices(sub);
    }
    if (session.return_url) return void res.redirect(303, session.return_url);
    page(res, 'Card saved', '<p>The simulated card is saved. You may close this page.</p>');
  });

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 0, options.host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  const { port } = server.address() as AddressInfo;
  const host = options.host === '0.0.0.0' || options.host === '::' ? 'localhost' : options.host;
  baseUrl = `http://${host}:${port}`;

  return {
    host,
    port,
    url: baseUrl,
    setPrices(list) {
      prices = new Map(list.map((p) => [p.id, p]));
    },
    meterEvents() {
      return structuredClone(Object.values(state.meterEvents));
    },
    setWebhookUrl(url) {
      webhookUrl = url;
      void deliver();
    },
    async drained() {
      while (state.pending.length > 0 && !closed && webhookUrl) {
        await new Promise((r) => setTimeout(r, 10));
      }
    },
    async close() {
      closed = true;
      clearTimeout(retryTimer);
      await delivering;
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
    },
  };
}

function escape(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
