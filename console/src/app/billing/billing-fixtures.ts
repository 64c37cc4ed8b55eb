import type { BillingOverview, Invoice, PlanOffer } from '../core/api-types.js';

// The plans on offer as the API starts with them (migrations 0001, 0007, 0013); the overage price
// and the grace days are made up for the specs (the migrations leave them to the operator).
export const FREE: PlanOffer = { id: 'free', name: 'Free', monthlyQuota: 1_000, ratePerMinute: 60, maxApiKeys: 5, price: null, overage: null, graceDays: 0 };
export const SHOP: PlanOffer = {
  id: 'shop',
  name: 'Shop',
  monthlyQuota: 50_000,
  ratePerMinute: 600,
  maxApiKeys: 25,
  price: { monthlyMinor: 2900, currency: 'eur' },
  overage: null,
  graceDays: 7,
};
export const PARTNER: PlanOffer = {
  id: 'partner',
  name: 'Partner',
  monthlyQuota: 500_000,
  ratePerMinute: 3000,
  maxApiKeys: 100,
  price: { monthlyMinor: 9900, currency: 'eur' },
  overage: { per1000Minor: 40 },
  graceDays: 14,
};

const PERIOD_END = '2027-01-01T10:00:00.000Z';

/** Harbor Lane on the shop plan set by the operator (no subscription), as the demo data starts. */
export function overview(overrides: Partial<BillingOverview> = {}): BillingOverview {
  return {
    plan: { id: 'shop', name: 'Shop' },
    state: 'internal',
    subscription: null,
    usage: { month: '2026-12', used: 409, monthlyQuota: 50_000, remaining: 49_591, overage: 0 },
    graceEndsAt: null,
    plans: [FREE, SHOP, PARTNER],
    simulated: true,
    ...overrides,
  };
}

/** Paying for a plan through a subscription, renewing at the period end. */
export function subscribed(plan: PlanOffer, overrides: Partial<BillingOverview> = {}): BillingOverview {
  return overview({
    plan: { id: plan.id, name: plan.name },
    state: 'active',
    subscription: { status: 'active', currentPeriodEnd: PERIOD_END, cancelAtPeriodEnd: false },
    usage: { month: '2026-12', used: 409, monthlyQuota: plan.monthlyQuota, remaining: plan.monthlyQuota - 409, overage: 0 },
    ...overrides,
  });
}

export const PAID_INVOICE: Invoice = {
  id: 'in_sim000004a1b2c3',
  number: 'SIM-00001',
  status: 'paid',
  amountDue: 9900,
  amountPaid: 9900,
  currency: 'eur',
  createdAt: '2026-12-02T10:00:00.000Z',
  url: 'http://127.0.0.1:4900/invoices/in_sim000004a1b2c3',
};
