import express, { type Request, type Response } from 'express';
import type { FakeLedger } from './fake-ledger.js';
import type { FakeInvoice, FakeMeterEvent, FakePortalSession, FakeSubscription } from './fake-state.js';

/** The provider's REST endpoints the API's SDK calls (mounted at /v1), answered from the ledger. */
export function fakeApiRouter(ledger: FakeLedger, secretKey: string): express.Router {
  const { state, now, prices, id, emit, changed, baseUrl, invoiceWith } = ledger;
  const refuse = (res: Response, status: number, message: string, type = 'invalid_request_error') => res.status(status).json({ error: { type, message } });
  const api = express.Router();
  api.use((req, res, next) => {
    if (req.headers.authorization !== `Bearer ${secretKey}`) return void refuse(res, 401, 'Invalid API key provided (simulation).', 'authentication_error');
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
      url: `${baseUrl()}/checkout/${sessionId}`,
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
    const data = all.slice(0, limit).map((i) => ({ ...i, hosted_invoice_url: `${baseUrl()}/invoices/${i.id}` }));
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
    const session: FakePortalSession = { id: sessionId, object: 'billing_portal.session', customer, return_url: text(b.return_url) ?? null, url: `${baseUrl()}/portal/${sessionId}`, created: now(), livemode: false };
    state.portalSessions[sessionId] = session;
    changed();
    res.json(session);
  });
  api.use((_req, res) => void refuse(res, 404, 'This call is not simulated.'));
  return api;
}
