import type { Express } from 'express';
import { MONTH_SECONDS, type FakeLedger } from './fake-ledger.js';
import type { FakeInvoiceLine } from './fake-state.js';

/** The calendar, on demand (the simulation has none): failed renewals, period ends, retried payments. */
export function addSimulationControls(app: Express, ledger: FakeLedger): void {
  const { state, prices, id, emit, changed, invoiceFor, unbilledEvents, payOpenInvoices } = ledger;
  // A renewal that fails.
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

  app.post('/simulation/subscriptions/:id/pay-open-invoices', (req, res) => {
    const sub = state.subscriptions[String(req.params.id)];
    if (!sub || sub.status === 'canceled') return void res.status(404).json({ error: 'no such active subscription' });
    res.json({ subscription: sub.id, paid: payOpenInvoices(sub).map((i) => i.id) });
  });

}
