import type { Express, Request, Response } from 'express';
import { MONTH_SECONDS, type FakeLedger } from './fake-ledger.js';
import type { FakePortalSession, FakeSubscription } from './fake-state.js';

const BANNER = 'Simulated payment provider: no real payment takes place and no card is charged.';

/** The provider's hosted pages a browser sees: checkout (pay / decline), invoice and payment details. */
export function addHostedPages(app: Express, ledger: FakeLedger): void {
  const { state, now, prices, id, emit, changed, invoiceFor, payOpenInvoices, openInvoicesOf, liveSubscriptionsOf } = ledger;
  // Plain HTML, each page saying it is a simulation.
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
    ledger.save();
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

}

function escape(s: string): string {
  return s.replace(/[&<>"']/g, (c) => `&#${c.charCodeAt(0)};`);
}
