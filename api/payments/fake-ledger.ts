import { randomBytes } from 'node:crypto';
import type { FakeEvent, FakeInvoice, FakeInvoiceLine, FakeState, FakeSubscription } from './fake-state.js';

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


/** A month of the simulation's calendar (it has no real one: periods end on demand). */
export const MONTH_SECONDS = 30 * 24 * 3600;
const API_VERSION = 'simulated';

/**
 * The simulation's books: its state and what the SDK endpoints, the hosted pages and the calendar
 * controls all do to it (ids, events to deliver, invoices). `onChange` saves and delivers.
 */
export function createFakeLedger(state: FakeState, clock: () => Date, save: () => void, onChange: () => void) {
  const now = () => Math.floor(clock().getTime() / 1000);
  /** Mutated in place (setPrices), never replaced: the parts hold this one map. */
  const prices = new Map<string, FakePrice>();
  let baseUrl = '';
  const changed = onChange;

  const id = (prefix: string) => `${prefix}_sim${(++state.seq).toString(36).padStart(6, '0')}${randomBytes(6).toString('hex')}`;

  const emit = (type: string, object: unknown) => {
    const event: FakeEvent = { id: id('evt'), object: 'event', type, created: now(), api_version: API_VERSION, livemode: false, data: { object: structuredClone(object) } };
    state.pending.push({ event, attempts: 0 });
  };

  /** A customer's meter events before `before` not yet on an invoice. */
  const unbilledEvents = (customer: string, before: number) =>
    Object.values(state.meterEvents).filter((e) => e.payload.stripe_customer_id === customer && e.invoiced === null && e.timestamp < before);


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

  const liveSubscriptionsOf = (customer: string) => Object.values(state.subscriptions).filter((s) => s.customer === customer && s.status !== 'canceled');

  return {
    state,
    now,
    prices,
    id,
    emit,
    save,
    changed,
    baseUrl: () => baseUrl,
    setBaseUrl(url: string) {
      baseUrl = url;
    },
    invoiceFor,
    invoiceWith,
    payOpenInvoices,
    openInvoicesOf,
    unbilledEvents,
    liveSubscriptionsOf,
  };
}

export type FakeLedger = ReturnType<typeof createFakeLedger>;
