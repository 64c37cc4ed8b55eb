import { formatDate } from '@angular/common';

import type { BillingOverview, BillingState, Invoice, PlanOffer } from '../core/api-types.js';

// The console speaks English; numbers and prices follow the same locale everywhere on the page.
const LOCALE = 'en';
const WHOLE = new Intl.NumberFormat(LOCALE, { maximumFractionDigits: 0 });

/** 500000 → "500,000". */
export function formatCount(value: number): string {
  return WHOLE.format(value);
}

/**
 * An amount in minor units as money: 2900 eur → "€29.00", 500 jpy → "¥500". The number of minor
 * digits comes from the currency (Intl knows that yen have none), not from a fixed 100.
 */
export function formatMoney(minor: number, currency: string): string {
  const format = new Intl.NumberFormat(LOCALE, { style: 'currency', currency: currency.toUpperCase() });
  const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
  return format.format(minor / 10 ** digits);
}

/** "€29.00 a month", or "No charge" for a plan that needs no payment. */
export function formatPlanPrice(offer: PlanOffer): string {
  return offer.price ? `${formatMoney(offer.price.monthlyMinor, offer.price.currency)} a month` : 'No charge';
}

/**
 * The price of 1,000 units past the quota ("€0.40"), or null where such calls are refused. The
 * overage is billed in the plan's currency; a plan without a price has none to name.
 */
export function overagePrice(offer: PlanOffer): string | null {
  if (!offer.overage) return null;
  return offer.price ? formatMoney(offer.overage.per1000Minor, offer.price.currency) : `${formatCount(offer.overage.per1000Minor)} minor units`;
}

/** What happens past the quota: its price per 1,000 units, or that such calls are refused. */
export function formatOverage(offer: PlanOffer): string {
  const price = overagePrice(offer);
  return price ? `Beyond the quota: ${price} per 1,000 units` : 'Calls beyond the quota are refused';
}

/** How long a paid plan stays after a failed payment. */
export function formatGrace(days: number): string {
  if (days === 0) return 'Back to Free at once after a failed payment';
  return `${days} ${days === 1 ? "day's" : "days'"} grace after a failed payment`;
}

/** "2026-12" → "December 2026". */
export function formatMonth(month: string): string {
  const [year, monthNumber] = month.split('-').map(Number);
  return new Intl.DateTimeFormat(LOCALE, { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(new Date(Date.UTC(year!, monthNumber! - 1, 1)));
}

/** A day as the console writes dates elsewhere (the DatePipe's mediumDate). `timeZone` is for specs. */
export function formatDay(iso: string, timeZone?: string): string {
  return formatDate(iso, 'mediumDate', 'en-US', timeZone);
}

/** The short name of a state, for the chip beside the plan's name. */
export const STATE_LABELS: Readonly<Record<BillingState, string>> = {
  free: 'Free',
  active: 'Active',
  past_due: 'Payment failed',
  ending: 'Ending',
  internal: 'Set by the operator',
};

/** The plan and its billing state in one plain sentence. */
export function describeState(overview: BillingOverview, timeZone?: string): string {
  const plan = overview.plan.name;
  const periodEnd = overview.subscription?.currentPeriodEnd ?? null;
  const day = (iso: string | null, otherwise: string) => (iso ? formatDay(iso, timeZone) : otherwise);
  switch (overview.state) {
    case 'active': {
      const next = overview.plans.find((p) => p.id === overview.subscription?.scheduledPlanId);
      if (next) return `Your ${plan} plan stays until ${day(periodEnd, 'the end of the period')}; then ${next.name} takes over (already chosen).`;
      return `Your ${plan} plan is active and renews on ${day(periodEnd, 'the next billing date')}.`;
    }
    case 'ending':
      return `Your ${plan} plan ends on ${day(periodEnd, 'the end of the period')} — back to Free then.`;
    case 'past_due': {
      const graceDays = overview.plans.find((p) => p.id === overview.plan.id)?.graceDays;
      const until = overview.graceEndsAt
        ? formatDay(overview.graceEndsAt, timeZone)
        : graceDays
          ? `the end of the ${graceDays}-day grace period`
          : 'the end of the grace period';
      return `A payment failed; your ${plan} plan stays until ${until}, then falls back to Free — update your payment details.`;
    }
    case 'free':
      return `You are on the Free plan: ${formatCount(overview.usage.monthlyQuota)} units a month and no payment. Choose a paid plan for more.`;
    case 'internal':
      return `Your ${plan} plan was set by the operator and is not billed.`;
  }
}

/** What choosing a plan card does, the button's label, and the line beneath it. */
export interface PlanAction {
  /**
   * current: the plan in force, nothing to do; checkout: a paid plan, paid for at the provider or
   * moved to in place; cancel: Free while a subscription runs, so the subscription ends at the
   * period end; unavailable: not something an admin can do here (the note says why).
   */
  kind: 'current' | 'checkout' | 'cancel' | 'unavailable';
  label: string;
  note?: string;
}

const LIVE: ReadonlySet<BillingState> = new Set(['active', 'past_due']);

/** The button a plan card shows for this organisation, and the line beneath it. */
export function planAction(overview: BillingOverview, offer: PlanOffer, timeZone?: string): PlanAction {
  if (offer.id === overview.plan.id) return { kind: 'current', label: 'Current plan' };
  const periodEnd = overview.subscription?.currentPeriodEnd ?? null;
  const atPeriodEnd = periodEnd ? `at the end of the period, on ${formatDay(periodEnd, timeZone)}` : 'at the end of the period';
  if (!offer.price) {
    if (LIVE.has(overview.state)) return { kind: 'cancel', label: `Switch to ${offer.name}`, note: `Takes effect ${atPeriodEnd}.` };
    if (overview.state === 'ending') return { kind: 'unavailable', label: `Switch to ${offer.name}`, note: `Already set: your plan ends ${atPeriodEnd}.` };
    return { kind: 'unavailable', label: `Switch to ${offer.name}`, note: 'Your plan was set by the operator: ask them to change it.' };
  }
  if (offer.id === overview.subscription?.scheduledPlanId) return { kind: 'unavailable', label: `Switch to ${offer.name}`, note: `Already chosen: takes effect ${atPeriodEnd}.` };
  // More units a month than the plan in force is an upgrade, whether or not that plan is on offer.
  if (offer.monthlyQuota > overview.usage.monthlyQuota) return { kind: 'checkout', label: `Upgrade to ${offer.name}` };
  const subscribed = LIVE.has(overview.state) || overview.state === 'ending';
  return subscribed
    ? { kind: 'checkout', label: `Switch to ${offer.name}`, note: `A downgrade: takes effect ${atPeriodEnd}.` }
    : { kind: 'checkout', label: `Switch to ${offer.name}` };
}

const INVOICE_STATUS: Readonly<Record<string, string>> = {
  paid: 'Paid',
  open: 'Due',
  draft: 'Draft',
  void: 'Void',
  uncollectible: 'Not collected',
};

/** An invoice's status in plain words (the provider's own word when it is a new one). */
export function invoiceStatus(invoice: Invoice): string {
  if (!invoice.status) return '—';
  return INVOICE_STATUS[invoice.status] ?? invoice.status;
}

/** Whether a plan change has reached the organisation: a subscription is in force (paid, failing or ending). */
export function subscriptionInForce(overview: BillingOverview): boolean {
  return overview.state === 'active' || overview.state === 'past_due' || overview.state === 'ending';
}
