import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Observable, Subject, of } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import type { KitOptionsRequest, KitOptionsResponse, StoredCatalogStrip } from './api-types.js';
import { ADD_TO_BASKET_EVENT, type AddToBasketDetail } from './basket-event.js';
import { Estimator, TYPING_PAUSE_MS } from './estimator.js';
import { EstimatorApi, ShopperError } from './estimator-api.js';
import { originRefused } from './shopper-problem.js';

// Harbor Lane's 24 V strip (demo-scenario.md) and one kit as the options endpoint answers it.
const strip: StoredCatalogStrip = { sku: 'HL-S24-10', kind: 'strip', unitPrice: 39, voltageV: 24, powerWPerM: 10, cutPitchMm: 50, description: 'CV strip 24 V 10 W/m', active: true } as StoredCatalogStrip;
const answer = {
  currency: 'EUR',
  possible: 6,
  designs: [
    {
      rank: 1,
      choices: { stripSku: 'HL-S24-10', voltageV: 24, powerWPerM: 10, cutPitchMm: 50, controllerSku: 'HL-K20', controllerPosition: 'middle', driverPosition: 'bottom' },
      pricing: { source: 'stored', catalogVersion: 1, currency: 'EUR', taxRatePercent: 20, net: 1000, tax: 200, gross: 1200, complete: true, unpricedLines: 0 },
      summary: { checks: { pass: 17, warn: 0, fail: 0 } },
      cart: [
        { sku: 'HL-S24-10', quantity: 3, unitPrice: 39 },
        { sku: 'HL-K20', quantity: 1, unitPrice: 120 },
      ],
      unpriced: [],
      warnings: [],
    },
  ],
  cautions: [{ code: 'mains', message: 'Mains work is for a licensed electrician.' }],
} as unknown as KitOptionsResponse;

class FakeApi {
  readonly asks: { request: KitOptionsRequest; answer: Subject<KitOptionsResponse>; cancelled: boolean }[] = [];
  kitOptions(_target: unknown, request: KitOptionsRequest): Observable<KitOptionsResponse> {
    return new Observable<KitOptionsResponse>((subscriber) => {
      const ask = { request, answer: new Subject<KitOptionsResponse>(), cancelled: false };
      this.asks.push(ask);
      let answered = false;
      const sub = ask.answer.subscribe({
        next: (v) => subscriber.next(v),
        error: (e) => ((answered = true), subscriber.error(e)),
        complete: () => ((answered = true), subscriber.complete()),
      });
      return () => {
        ask.cancelled = !answered; // torn down before its answer came: the request was cancelled
        sub.unsubscribe();
      };
    });
  }
  strips(): Observable<StoredCatalogStrip[]> {
    return of([strip]);
  }
}

let fake: FakeApi;
let fixture: ComponentFixture<Estimator>;

function shadow(): ShadowRoot {
  return (fixture.nativeElement as HTMLElement).shadowRoot!;
}

async function type(field: string, value: string): Promise<void> {
  const input = shadow().querySelector<HTMLInputElement>(`[data-field="${field}"]`)!;
  input.value = value;
  input.dispatchEvent(new Event('input'));
  await vi.advanceTimersByTimeAsync(50); // a quick typist: well inside the typing pause
}

async function pause(): Promise<void> {
  await vi.advanceTimersByTimeAsync(TYPING_PAUSE_MS + 10);
  await fixture.whenStable();
}

async function settle(): Promise<void> {
  await vi.advanceTimersByTimeAsync(10);
  await fixture.whenStable();
}

async function typeAlderRow(): Promise<void> {
  await type('treads', '14');
  await type('treadWidthMm', '900');
  await type('riserHeightMm', '185');
  await type('goingMm', '250');
}

beforeEach(async () => {
  vi.useFakeTimers();
  fake = new FakeApi();
  TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection(), { provide: EstimatorApi, useValue: fake }] });
  fixture = TestBed.createComponent(Estimator);
  fixture.componentRef.setInput('embedKey', 'tw_embed_abc_secret');
  fixture.componentRef.setInput('apiUrl', 'https://api.treadwise.test');
  fixture.componentRef.setInput('locale', 'en-IE');
  await settle();
});

afterEach(() => {
  vi.useRealTimers();
});

describe('Estimator', () => {
  it('asks once per pause in typing, and a newer stair cancels the request under way', async () => {
    await typeAlderRow();
    expect(fake.asks).toHaveLength(0); // still typing
    await pause();
    expect(fake.asks).toHaveLength(1);
    expect(fake.asks[0]!.request.staircase).toEqual({ treads: 14, treadWidthMm: 900, riserHeightMm: 185, goingMm: 250 });

    await type('treads', '15');
    await pause();
    expect(fake.asks).toHaveLength(2);
    expect(fake.asks[0]!.cancelled).toBe(true);
    expect(fake.asks[1]!.request.staircase.treads).toBe(15);
  });

  it('shows the kit’s price in the shop’s locale, its checks in words, and keeps the cautions in view', async () => {
    expect(shadow().querySelector('.cautions')!.textContent).toContain('qualified electrician'); // before any answer
    await typeAlderRow();
    await pause();
    fake.asks[0]!.answer.next(answer);
    await settle();
    const text = shadow().textContent!;
    expect(shadow().querySelector('[data-testid="total"]')!.textContent).toBe('€1,200.00');
    expect(text).toContain('All 17 design checks pass');
    expect(shadow().querySelector('.cautions')!.textContent).toContain('Mains work is for a licensed electrician.');
    const status = shadow().querySelector('[data-testid="announcement"]')!;
    expect(status.getAttribute('aria-live')).toBe('polite'); // announced once per answer, briefly
    expect(status.textContent).toBe('Kit for your stair: €1,200.00. All 17 design checks pass: power, cable lengths, voltage drop and controller outputs.');

    // The next stair: the last kit stays in view while the new one is worked out.
    await type('treads', '15');
    await pause();
    expect(shadow().querySelector('[data-testid="total"]')!.textContent).toBe('€1,200.00');
    expect(shadow().querySelector('.result')!.getAttribute('aria-busy')).toBe('true');
  });

  it('hands the cart lines to the page in a treadwise-add-to-basket event that leaves the shadow root', async () => {
    await typeAlderRow();
    await pause();
    fake.asks[0]!.answer.next(answer);
    await settle();
    const seen: CustomEvent<AddToBasketDetail>[] = [];
    document.addEventListener(ADD_TO_BASKET_EVENT, (e) => seen.push(e as CustomEvent<AddToBasketDetail>), { once: true });
    shadow().querySelector<HTMLButtonElement>('[data-testid="add-to-basket"]')!.click();
    await settle();
    expect(seen).toHaveLength(1);
    expect(seen[0]!.bubbles && seen[0]!.composed).toBe(true);
    expect(seen[0]!.detail).toEqual({ lines: [{ sku: 'HL-S24-10', quantity: 3, unitPrice: 39 }, { sku: 'HL-K20', quantity: 1, unitPrice: 120 }], currency: 'EUR' });
    expect(shadow().querySelector('[data-testid="added"]')!.textContent).toContain('added to your basket');
  });

  it('shows a refusal the shopper understands, never a blank box', async () => {
    await typeAlderRow();
    await pause();
    fake.asks[0]!.answer.error(new ShopperError(originRefused()));
    await settle();
    const alert = shadow().querySelector('[role="alert"]')!;
    expect(alert.getAttribute('data-problem')).toBe('origin');
    expect(alert.textContent).toContain('not enabled for this website');
  });

  it('gives the retry time of a rate limit and asks again by itself once it has passed', async () => {
    await typeAlderRow();
    await pause();
    fake.asks[0]!.answer.error(new ShopperError({ kind: 'rate-limit', message: 'Please try again in 5 seconds.', retryAfterS: 5 }));
    await settle();
    expect(shadow().querySelector('[role="alert"]')!.textContent).toContain('try again in 5 seconds');
    await vi.advanceTimersByTimeAsync(5_000);
    await pause();
    expect(fake.asks).toHaveLength(2);
    expect(fake.asks[1]!.request).toEqual(fake.asks[0]!.request);
  });

  it('says what is missing when the shop left out its key', async () => {
    fixture.componentRef.setInput('embedKey', '');
    await settle();
    expect(shadow().querySelector('[role="alert"]')!.textContent).toContain('missing its key');
  });

  it('labels every measurement field', () => {
    for (const input of Array.from(shadow().querySelectorAll('input[data-field], select'))) {
      expect(shadow().querySelector(`label[for="${input.id}"]`), input.id).not.toBeNull();
    }
  });
});
