import { describe, expect, it } from 'vitest';

import { FREE, PAID_INVOICE, PARTNER, SHOP, overview, subscribed } from './billing-fixtures.js';
import { describeState, formatGrace, formatMoney, formatMonth, formatOverage, formatPlanPrice, invoiceStatus, planAction, subscriptionInForce } from './billing-format.js';

const UTC = 'UTC'; // dates in the specs are read in UTC, whatever the machine's zone

describe('formatMoney', () => {
  it('turns minor units into the currency’s own major units and symbol', () => {
    expect(formatMoney(2900, 'eur')).toBe('€29.00');
    expect(formatMoney(9905, 'usd')).toBe('$99.05');
    expect(formatMoney(40, 'eur')).toBe('€0.40');
    expect(formatMoney(0, 'gbp')).toBe('£0.00');
  });

  it('knows currencies without minor units (yen) and with three (dinar)', () => {
    expect(formatMoney(500, 'jpy')).toBe('¥500');
    expect(formatMoney(1500, 'kwd')).toBe('KWD\u00a01.500') // Intl puts a no-break space after a code;
  });

  it('groups thousands', () => {
    expect(formatMoney(1_234_500, 'eur')).toBe('€12,345.00');
  });
});

describe('the plan card’s wording', () => {
  it('prices a paid plan by the month and a free one as no charge', () => {
    expect(formatPlanPrice(PARTNER)).toBe('€99.00 a month');
    expect(formatPlanPrice(FREE)).toBe('No charge');
  });

  it('names the overage price, or says calls past the quota are refused', () => {
    expect(formatOverage(PARTNER)).toBe('Beyond the quota: €0.40 per 1,000 units');
    expect(formatOverage(SHOP)).toBe('Calls beyond the quota are refused');
  });

  it('says how long a paid plan outlasts a failed payment', () => {
    expect(formatGrace(14)).toBe("14 days' grace after a failed payment");
    expect(formatGrace(1)).toBe("1 day's grace after a failed payment");
    expect(formatGrace(0)).toBe('Back to Free at once after a failed payment');
  });

  it('writes the usage month in words', () => {
    expect(formatMonth('2026-12')).toBe('December 2026');
    expect(formatMonth('2027-01')).toBe('January 2027');
  });
});

describe('describeState', () => {
  it('active: renewing on the period end', () => {
    expect(describeState(subscribed(PARTNER), UTC)).toBe('Your Partner plan is active and renews on Jan 1, 2027.');
  });

  it('ending: the day it ends, and Free after', () => {
    const ending = subscribed(PARTNER, { state: 'ending', subscription: { status: 'active', currentPeriodEnd: '2027-01-01T10:00:00.000Z', cancelAtPeriodEnd: true } });
    expect(describeState(ending, UTC)).toBe('Your Partner plan ends on Jan 1, 2027 — back to Free then.');
  });

  it('past due: the plan stays until the grace ends, then Free, and what to do', () => {
    const failing = subscribed(SHOP, { state: 'past_due', graceEndsAt: '2026-12-09T10:00:00.000Z' });
    expect(describeState(failing, UTC)).toBe(
      'A payment failed; your Shop plan stays until Dec 9, 2026, then falls back to Free — update your payment details.',
    );
  });

  it('past due without a grace end from the API: the plan’s grace days instead of a date', () => {
    const failing = subscribed(SHOP, { state: 'past_due', graceEndsAt: null });
    expect(describeState(failing, UTC)).toContain('stays until the end of the 7-day grace period, then falls back to Free');
  });

  it('free: the quota and that nothing is paid', () => {
    const free = overview({ plan: { id: 'free', name: 'Free' }, state: 'free', usage: { month: '2026-12', used: 12, monthlyQuota: 1000, remaining: 988, overage: 0 } });
    expect(describeState(free, UTC)).toBe('You are on the Free plan: 1,000 units a month and no payment. Choose a paid plan for more.');
  });

  it('internal: set by the operator, not billed', () => {
    expect(describeState(overview(), UTC)).toBe('Your Shop plan was set by the operator and is not billed.');
  });
});

describe('a downgrade already chosen', () => {
  const scheduled = () => {
    const o = subscribed(PARTNER);
    return { ...o, subscription: { ...o.subscription!, scheduledPlanId: 'shop' } };
  };
  it('says which plan takes over and when', () => {
    expect(describeState(scheduled(), UTC)).toBe('Your Partner plan stays until Jan 1, 2027; then Shop takes over (already chosen).');
  });
  it('offers no second switch to the plan already chosen', () => {
    expect(planAction(scheduled(), SHOP, UTC)).toEqual({ kind: 'unavailable', label: 'Switch to Shop', note: 'Already chosen: takes effect at the end of the period, on Jan 1, 2027.' });
  });
});

describe('planAction', () => {
  it('marks the plan in force as current', () => {
    expect(planAction(subscribed(PARTNER), PARTNER, UTC)).toEqual({ kind: 'current', label: 'Current plan' });
  });

  it('offers an upgrade to a plan with more units, by checkout', () => {
    expect(planAction(overview(), PARTNER, UTC)).toEqual({ kind: 'checkout', label: 'Upgrade to Partner' });
    expect(planAction(subscribed(SHOP), PARTNER, UTC)).toEqual({ kind: 'checkout', label: 'Upgrade to Partner' });
  });

  it('says a downgrade of a running subscription waits for the period end', () => {
    expect(planAction(subscribed(PARTNER), SHOP, UTC)).toEqual({ kind: 'checkout', label: 'Switch to Shop', note: 'A downgrade: takes effect at the end of the period, on Jan 1, 2027.' });
  });

  it('turns Free into a cancellation at the period end while a subscription runs', () => {
    expect(planAction(subscribed(SHOP), FREE, UTC)).toEqual({ kind: 'cancel', label: 'Switch to Free', note: 'Takes effect at the end of the period, on Jan 1, 2027.' });
  });

  it('offers no cancellation twice, nor one where there is no subscription', () => {
    const ending = subscribed(SHOP, { state: 'ending' });
    expect(planAction(ending, FREE, UTC).kind).toBe('unavailable');
    expect(planAction(overview(), FREE, UTC)).toEqual({ kind: 'unavailable', label: 'Switch to Free', note: 'Your plan was set by the operator: ask them to change it.' });
  });
});

describe('the rest', () => {
  it('puts invoice statuses in plain words', () => {
    expect(invoiceStatus(PAID_INVOICE)).toBe('Paid');
    expect(invoiceStatus({ ...PAID_INVOICE, status: 'open' })).toBe('Due');
    expect(invoiceStatus({ ...PAID_INVOICE, status: null })).toBe('—');
  });

  it('counts a subscription as in force while it is paid, failing or ending, not on free or operator plans', () => {
    expect(subscriptionInForce(subscribed(PARTNER))).toBe(true);
    expect(subscriptionInForce(subscribed(PARTNER, { state: 'ending' }))).toBe(true);
    expect(subscriptionInForce(overview())).toBe(false);
    expect(subscriptionInForce(overview({ state: 'free' }))).toBe(false);
  });
});
