import { mkdirSync, readFileSync, renameSync, writeFileSync } from 'node:fs';
import path from 'node:path';

/** What the local payment fake remembers; objects are shaped like the provider's so the SDK reads them. */
export interface FakeState {
  seq: number;
  customers: Record<string, { id: string; object: 'customer'; email: string | null; name: string | null; metadata: Record<string, string>; created: number }>;
  sessions: Record<string, FakeSession>;
  subscriptions: Record<string, FakeSubscription>;
  invoices: Record<string, FakeInvoice>;
  /** Usage reported to meters, by identifier (a second event with one is dropped, as the provider does). */
  meterEvents: Record<string, FakeMeterEvent>;
  /** Hosted payment-details pages handed out (billing portal sessions). */
  portalSessions: Record<string, FakePortalSession>;
  /** Events not yet acknowledged with a 2xx by the webhook endpoint (a restart resumes them). */
  pending: { event: FakeEvent; attempts: number }[];
}

export interface FakeSession {
  id: string;
  object: 'checkout.session';
  mode: 'subscription';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  customer: string;
  client_reference_id: string | null;
  metadata: Record<string, string>;
  subscription: string | null;
  success_url: string | null;
  cancel_url: string | null;
  url: string;
  price: string;
  declined: boolean;
  created: number;
}

export interface FakePortalSession {
  id: string;
  object: 'billing_portal.session';
  customer: string;
  return_url: string | null;
  url: string;
  created: number;
  livemode: false;
}

export interface FakeSubscription {
  id: string;
  object: 'subscription';
  customer: string;
  status: 'active' | 'past_due' | 'canceled' | 'unpaid';
  cancel_at_period_end: boolean;
  canceled_at: number | null;
  metadata: Record<string, string>;
  created: number;
  /** Proration lines (create_prorations) waiting for the next invoice. */
  pending_lines?: FakeInvoiceLine[];
  items: { object: 'list'; data: { id: string; object: 'subscription_item'; price: { id: string; object: 'price'; unit_amount: number; currency: string }; current_period_start: number; current_period_end: number }[] };
}

export interface FakeInvoice {
  id: string;
  object: 'invoice';
  customer: string;
  subscription: string;
  status: 'paid' | 'open';
  amount_due: number;
  amount_paid: number;
  currency: string;
  created: number;
  period_start: number;
  period_end: number;
  hosted_invoice_url: string;
  number: string;
  /** Absent on invoices written by an older simulation. */
  lines?: { object: 'list'; data: FakeInvoiceLine[] };
}

export interface FakeInvoiceLine {
  id: string;
  object: 'line_item';
  description: string;
  amount: number;
  currency: string;
  /** Pending proration lines (create_prorations) wait for the next invoice under this key. */
  proration: boolean;
}

export interface FakeMeterEvent {
  object: 'billing.meter_event';
  event_name: string;
  identifier: string;
  payload: Record<string, string>;
  timestamp: number;
  created: number;
  livemode: false;
  /** The renewal invoice that billed it; null until then. */
  invoiced: string | null;
}

export interface FakeEvent {
  id: string;
  object: 'event';
  type: string;
  created: number;
  api_version: string;
  livemode: false;
  data: { object: unknown };
}

const empty = (): FakeState => ({ seq: 0, customers: {}, sessions: {}, subscriptions: {}, invoices: {}, meterEvents: {}, portalSessions: {}, pending: [] });

/** The fake's state in one JSON file, replaced atomically (write beside, then rename) after every change. */
export function fakeStateFile(dataDir: string) {
  const file = path.join(dataDir, 'payments-simulation.json');
  return {
    file,
    load(): FakeState {
      try {
        return { ...empty(), ...(JSON.parse(readFileSync(file, 'utf8')) as Partial<FakeState>) };
      } catch (err) {
        if ((err as NodeJS.ErrnoException).code === 'ENOENT') return empty();
        throw err;
      }
    },
    save(state: FakeState): void {
      mkdirSync(dataDir, { recursive: true });
      const tmp = `${file}.${process.pid}.tmp`;
      writeFileSync(tmp, JSON.stringify(state), { mode: 0o600 });
      renameSync(tmp, file);
    },
  };
}
