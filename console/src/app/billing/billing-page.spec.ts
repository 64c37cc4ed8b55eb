import { OverlayContainer } from '@angular/cdk/overlay';
import { Location } from '@angular/common';
import { HttpTestingController } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Subject } from 'rxjs';
import { afterEach, describe, expect, it, vi } from 'vitest';

import { POLL_WAIT } from '../core/poll.js';
import type { BillingOverview, Invoice, Role } from '../core/api-types.js';
import { pageSpecProviders } from '../core/page-spec-providers.js';
import { PAID_INVOICE, PARTNER, SHOP, overview, subscribed } from './billing-fixtures.js';
import { BillingPage } from './billing-page.js';
import { LEAVE_FOR } from './checkout-redirect.js';
import { MAX_ASKS } from './plan-watch.js';

const CHECKOUT_URL = 'http://127.0.0.1:4900/checkout/cs_sim0000011a2b3c';

describe('BillingPage', () => {
  let fixture: ComponentFixture<BillingPage>;
  let http: HttpTestingController;
  let clock: Subject<void>;
  let waits: number[];
  let leftFor: string[];

  async function render(role: Role, checkout?: string): Promise<void> {
    clock = new Subject<void>();
    waits = [];
    leftFor = [];
    const wait = (ms: number) => {
      waits.push(ms);
      return clock.asObservable();
    };
    TestBed.configureTestingModule({
      providers: [...pageSpecProviders(role), { provide: POLL_WAIT, useValue: wait }, { provide: LEAVE_FOR, useValue: (url: string) => leftFor.push(url) }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BillingPage);
    if (checkout) fixture.componentRef.setInput('checkout', checkout);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const text = (selector: string) => page().querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const tick = async () => {
    clock.next();
    await settle();
  };
  const answerOverview = async (body: BillingOverview, headers: Record<string, string> = {}) => {
    http.expectOne((r) => r.method === 'GET' && r.url === '/v1/billing').flush(body, { headers });
    await settle();
  };
  const answerInvoices = async (items: Invoice[]) => {
    http.expectOne((r) => r.url === '/v1/billing/invoices' && r.params.get('limit') === '24').flush({ items });
    await settle();
  };
  const button = (offer: string) => page().querySelector<HTMLButtonElement>(`[data-offer="${offer}"] [data-testid="offer-choose"]`)!;

  it('shows an admin the plan in plain words, the usage, the plans with their prices and the invoices', async () => {
    await render('admin');
    await answerOverview(overview());
    await answerInvoices([PAID_INVOICE]);

    expect(text('[data-testid="billing-simulated"]')).toBe('Payments are simulated on this server — no money moves.');
    expect(text('[data-testid="billing-plan-name"]')).toBe('Shop');
    expect(text('[data-testid="billing-state"]')).toBe('Your Shop plan was set by the operator and is not billed.');
    expect(text('[data-testid="billing-usage"]')).toContain('409 of 50,000 units used, 49,591 left.');
    expect(page().querySelector('[role="meter"]')?.getAttribute('aria-valuenow')).toBe('409');
    expect(text('[data-testid="billing-overage"]')).toBeUndefined(); // shop refuses calls past the quota, and there is room left

    const cards = [...page().querySelectorAll('[data-offer]')].map((c) => c.getAttribute('data-offer'));
    expect(cards).toEqual(['free', 'shop', 'partner']);
    expect(text('[data-offer="partner"] [data-testid="offer-price"]')).toBe('€99.00 a month');
    expect(text('[data-offer="partner"] [data-testid="offer-overage"]')).toBe('Beyond the quota: €0.40 per 1,000 units');
    expect(text('[data-offer="shop"] [data-testid="offer-overage"]')).toBe('Calls beyond the quota are refused');
    expect(button('shop').disabled).toBe(true);
    expect(button('shop').textContent?.trim()).toBe('Current plan');
    expect(button('partner').textContent?.trim()).toBe('Upgrade to Partner');

    const link = page().querySelector<HTMLAnchorElement>(`[data-invoice="${PAID_INVOICE.id}"] [data-testid="invoice-link"]`)!;
    expect(link.href).toBe(PAID_INVOICE.url);
    expect(link.target).toBe('_blank');
    expect(link.rel).toBe('noopener');
    expect(text(`[data-invoice="${PAID_INVOICE.id}"]`)).toContain('SIM-00001');
    expect(text(`[data-invoice="${PAID_INVOICE.id}"]`)).toContain('€99.00');
    expect(text(`[data-invoice="${PAID_INVOICE.id}"] [data-testid="invoice-status"]`)).toBe('Paid');
  });

  it('shows a viewer the plan and its price but no buttons, and asks for no invoices', async () => {
    await render('viewer');
    await answerOverview(overview({ simulated: false }));
    http.expectNone('/v1/billing/invoices?limit=24');
    expect(text('[data-testid="billing-read-only"]')).toContain('Only an admin');
    expect(page().querySelector('[data-testid="offer-choose"]')).toBeNull();
    expect(page().querySelector('[data-testid="invoice-table"]')).toBeNull();
    expect(page().querySelector('[data-testid="billing-simulated"]')).toBeNull();
  });

  it('shows the overage of a plan that bills it, with its price', async () => {
    await render('admin');
    await answerOverview(subscribed(PARTNER, { usage: { month: '2026-12', used: 512_345, monthlyQuota: 500_000, remaining: 0, overage: 12_345 } }));
    await answerInvoices([]);
    expect(text('[data-testid="billing-overage"]')).toBe('12,345 units beyond the quota so far, billed with the next invoice at €0.40 per 1,000 units.');
    expect(page().querySelector('[role="meter"]')?.getAttribute('aria-valuenow')).toBe('500000');
    expect(page().querySelector('[data-testid="invoices-empty"]')).not.toBeNull();
  });

  it('after a failed payment: says until when the plan stays, and that calls past a used-up quota are refused', async () => {
    await render('admin');
    await answerOverview(
      subscribed(SHOP, { state: 'past_due', graceEndsAt: '2026-12-09T10:00:00.000Z', usage: { month: '2026-12', used: 50_000, monthlyQuota: 50_000, remaining: 0, overage: 0 } }),
    );
    await answerInvoices([{ ...PAID_INVOICE, status: 'open', amountDue: 2900, amountPaid: 0 }]);
    expect(text('[data-testid="billing-plan"] .tw-chip')).toBe('Payment failed');
    expect(text('[data-testid="billing-state"]')).toMatch(/^A payment failed; your Shop plan stays until Dec (8|9|10), 2026, then falls back to Free — update your payment details\.$/);
    expect(text('[data-testid="billing-overage"]')).toBe('The quota is used up: further calls are refused until the month ends.');
    expect(text('[data-testid="invoice-status"]')).toBe('Due');
  });

  it('after a failed payment: sends the admin to the provider’s page to change the card, once', async () => {
    await render('admin');
    await answerOverview(subscribed(SHOP, { state: 'past_due', graceEndsAt: '2026-12-09T10:00:00.000Z' }));
    await answerInvoices([]);
    const card = page().querySelector<HTMLButtonElement>('[data-testid="billing-payment-details"]')!;
    expect(card.textContent?.trim()).toBe('Update payment details and pay');
    card.click();
    await settle();
    http.expectOne((r) => r.method === 'POST' && r.url === '/v1/billing/payment-details').flush({ url: 'http://127.0.0.1:4999/portal/bps_1' });
    await settle();
    expect(leftFor).toEqual(['http://127.0.0.1:4999/portal/bps_1']);
    expect(card.disabled).toBe(true);
  });

  it('shows a viewer no payment-details button', async () => {
    await render('viewer');
    await answerOverview(subscribed(SHOP, { state: 'past_due', graceEndsAt: '2026-12-09T10:00:00.000Z' }));
    expect(page().querySelector('[data-testid="billing-payment-details"]')).toBeNull();
  });

  it('says what the API answered when billing cannot be loaded', async () => {
    await render('admin');
    http
      .expectOne('/v1/billing')
      .flush({ title: 'Payments unavailable', status: 503, detail: 'No payment provider is configured on this server.' }, { status: 503, statusText: 'Service Unavailable' });
    http.expectOne('/v1/billing/invoices?limit=24').flush({ title: 'Payments unavailable', status: 503 }, { status: 503, statusText: 'Service Unavailable' });
    await settle();
    expect(text('[data-testid="billing-failed"]')).toContain('No payment provider is configured on this server.');
  });

  it('sends the browser to the provider’s checkout page for an upgrade', async () => {
    await render('admin');
    await answerOverview(overview());
    await answerInvoices([]);
    button('partner').click();
    await settle();
    const started = http.expectOne((r) => r.method === 'POST' && r.url === '/v1/billing/checkout');
    expect(started.request.body).toEqual({ planId: 'partner' });
    started.flush({ outcome: 'checkout', url: CHECKOUT_URL });
    await settle();
    expect(leftFor).toEqual([CHECKOUT_URL]);
    expect(button('partner').disabled).toBe(true); // no second checkout while the browser leaves
  });

  it('reloads the overview and says so when the subscription was changed in place', async () => {
    await render('admin');
    await answerOverview(subscribed(SHOP));
    await answerInvoices([]);
    button('partner').click();
    await settle();
    http.expectOne('/v1/billing/checkout').flush({ outcome: 'changed', url: null });
    await settle();
    await answerOverview(subscribed(PARTNER));
    await answerInvoices([PAID_INVOICE]);
    expect(leftFor).toEqual([]);
    expect(text('[data-testid="billing-plan-name"]')).toBe('Partner');
    expect(button('partner').textContent?.trim()).toBe('Current plan');
    expect(page().querySelector(`[data-invoice="${PAID_INVOICE.id}"]`)).not.toBeNull();
    expect(overlay().textContent).toContain('Done: you are on the Partner plan.');
  });

  it('shows a refused checkout in the snack bar and frees the button', async () => {
    await render('admin');
    await answerOverview(overview());
    await answerInvoices([]);
    button('partner').click();
    await settle();
    http
      .expectOne('/v1/billing/checkout')
      .flush({ title: 'Payment provider error', status: 502, detail: 'The payment provider gave no checkout address.' }, { status: 502, statusText: 'Bad Gateway' });
    await settle();
    expect(overlay().textContent).toContain('The payment provider gave no checkout address.');
    expect(button('partner').disabled).toBe(false);
    expect(leftFor).toEqual([]);
  });

  it('asks before switching to Free, naming the day the plan ends, and cancels only when confirmed', async () => {
    await render('admin');
    await answerOverview(subscribed(SHOP));
    await answerInvoices([]);
    expect(text('[data-offer="free"] [data-testid="offer-note"]')).toContain('Takes effect at the end of the period');

    button('free').click();
    await settle();
    expect(overlay().querySelector('[data-testid="cancel-plan-title"]')?.textContent).toContain('Switch to Free on Jan 1, 2027?');
    expect(overlay().querySelector('[data-testid="cancel-plan-text"]')?.textContent).toContain('Your Shop plan stays in force until Jan 1, 2027');
    (overlay().querySelector('[data-testid="cancel-plan-keep"]') as HTMLButtonElement).click();
    await settle();
    http.expectNone('/v1/billing/cancel');

    button('free').click();
    await settle();
    (overlay().querySelector('[data-testid="cancel-plan-confirm"]') as HTMLButtonElement).click();
    await settle();
    http.expectOne((r) => r.method === 'POST' && r.url === '/v1/billing/cancel').flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    await answerOverview(subscribed(SHOP, { state: 'ending', subscription: { status: 'active', currentPeriodEnd: '2027-01-01T10:00:00.000Z', cancelAtPeriodEnd: true } }));
    await answerInvoices([]);
    expect(text('[data-testid="billing-state"]')).toContain('ends on Jan 1, 2027 — back to Free then');
    expect(overlay().textContent).toContain('Your Shop plan ends on Jan 1, 2027; then you are on Free.');
  });

  it('back from a payment: waits as Retry-After says until the plan changes, then stops asking', async () => {
    await render('admin', 'done');
    const replaceState = vi.spyOn(TestBed.inject(Location), 'replaceState');
    await answerInvoices([]);
    await answerOverview(overview(), { 'Retry-After': '1' }); // the webhook has not landed yet
    expect(text('[data-testid="billing-confirming"]')).toBe('Payment received, applying your plan…');
    expect(text('[data-testid="billing-plan-name"]')).toBe('Shop');
    expect(waits).toEqual([1000]);

    await tick();
    await answerOverview(overview()); // still not: the usual pause
    expect(waits).toEqual([1000, 2000]);

    await tick();
    await answerOverview(subscribed(PARTNER));
    await answerInvoices([PAID_INVOICE]);
    expect(page().querySelector('[data-testid="billing-confirming"]')).toBeNull();
    expect(text('[data-testid="billing-plan-name"]')).toBe('Partner');
    expect(text('[data-testid="billing-limits"]')).toContain('500,000 units a month');
    expect(page().querySelector(`[data-invoice="${PAID_INVOICE.id}"]`)).not.toBeNull();
    expect(overlay().textContent).toContain('Payment received: you are on the Partner plan.');
    expect(replaceState).toHaveBeenCalledWith('/billing');
    expect(clock.observed).toBe(false); // no timer left running
    await tick();
    http.expectNone('/v1/billing');
  });

  it('back from a payment the provider has not confirmed: gives up after a while and says so', async () => {
    await render('admin', 'done');
    await answerInvoices([]);
    for (let ask = 1; ask <= MAX_ASKS; ask++) {
      await answerOverview(overview());
      if (ask < MAX_ASKS) await tick();
    }
    expect(clock.observed).toBe(false);
    expect(page().querySelector('[data-testid="billing-confirming"]')).toBeNull();
    expect(text('[data-testid="billing-confirming-late"]')).toContain('has not confirmed the payment yet');
  });

  it('stops asking when the page is left while a payment is being applied', async () => {
    await render('admin', 'done');
    await answerInvoices([]);
    await answerOverview(overview());
    expect(clock.observed).toBe(true);
    fixture.destroy();
    expect(clock.observed).toBe(false);
    clock.next();
    http.expectNone('/v1/billing');
  });
});
