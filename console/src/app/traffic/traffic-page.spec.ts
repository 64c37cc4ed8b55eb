import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, type TestRequest, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { CLOCK } from '../core/clock.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import { day, report } from './traffic-fixtures.js';
import { TrafficPage } from './traffic-page.js';

const CHECKOUT = 'h7kq2mzx4c5d';

describe('TrafficPage', () => {
  let fixture: ComponentFixture<TrafficPage>;
  let http: HttpTestingController;

  async function render(role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: CLOCK, useValue: () => new Date('2026-12-02T10:00:00.000Z') },
        { provide: Auth, useValue: { role: signal<Role | null>(role) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TrafficPage);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };
  const usage = (match: (p: URLSearchParams) => boolean): TestRequest =>
    http.expectOne((r) => r.url === '/v1/usage' && match(new URLSearchParams(r.params.toString())));

  it('asks for the last 30 days, then one report per busy key, and shows the figures and the quota', async () => {
    await render('viewer');
    http.expectNone('/v1/keys?limit=200'); // a viewer may not list keys: ids stand in for names
    const range = (p: URLSearchParams) => p.get('from') === '2026-11-03' && p.get('to') === '2026-12-02';
    usage((p) => range(p) && !p.has('keyId')).flush(
      report([day('2026-12-01', 12, { limited: 2, byStatusClass: { '2xx': 8, '3xx': 0, '4xx': 4, '5xx': 0 } }), day('2026-12-02', 0)], [{ keyId: CHECKOUT, requests: 12 }]),
    );
    await settle();
    usage((p) => range(p) && p.get('keyId') === CHECKOUT).flush(report([day('2026-12-01', 12), day('2026-12-02', 0)], [{ keyId: CHECKOUT, requests: 12 }]));
    await settle();

    expect(page().querySelector('[data-testid="figure-calls"]')?.textContent?.trim()).toBe('12');
    expect(page().querySelector('[data-testid="figure-errors"]')?.textContent?.trim()).toBe('2');
    expect(page().querySelector('[data-testid="figure-limited"]')?.textContent?.trim()).toBe('2');
    expect(page().querySelector('[data-testid="traffic-quota"]')?.textContent).toContain('409 of 50,000');
    expect(page().querySelector('[data-testid="traffic-chart"] canvas')).not.toBeNull();
    expect(page().querySelectorAll('[data-testid="traffic-days"] tbody tr').length).toBe(1); // quiet days are left out of the table
  });

  it('says so when the range had no calls, and still shows the quota', async () => {
    await render('estimator');
    usage(() => true).flush(report([day('2026-12-02', 0)], []));
    await settle();
    expect(page().querySelector('[data-testid="traffic-empty"]')).not.toBeNull();
    expect(page().querySelector('[data-testid="traffic-quota"]')).not.toBeNull();
    expect(page().querySelector('[data-testid="traffic-chart"]')).toBeNull();
  });

  it('keeps a reversed range beside the filters and asks nothing', async () => {
    await render('viewer');
    usage(() => true).flush(report([day('2026-12-02', 0)], []));
    await settle();
    const from = page().querySelector<HTMLInputElement>('[data-testid="traffic-from"]')!;
    from.value = '2026-12-05';
    from.dispatchEvent(new Event('input'));
    page().querySelector<HTMLButtonElement>('[data-testid="traffic-apply"]')!.click();
    await settle();
    expect(page().querySelector('[data-testid="traffic-range-error"]')?.textContent).toContain('must not be after');
    http.expectNone('/v1/usage');
  });

  it('shows the problem detail when the usage cannot be read', async () => {
    await render('viewer');
    usage(() => true).flush({ title: 'Bad request', status: 400, detail: 'at most 366 days from `to`' }, { status: 400, statusText: 'Bad Request' });
    await settle();
    expect(page().querySelector('[data-testid="traffic-failed"]')?.textContent).toContain('at most 366 days');
  });

  it('names keys for an admin and asks the export route for the CSV with the same filters', async () => {
    await render('admin');
    http.expectOne('/v1/keys?limit=200').flush({ items: [{ keyId: CHECKOUT, name: 'Checkout server' }], nextCursor: null });
    usage((p) => !p.has('keyId')).flush(report([day('2026-12-01', 3)], [{ keyId: CHECKOUT, requests: 3 }]));
    await settle();
    usage((p) => p.get('keyId') === CHECKOUT).flush(report([day('2026-12-01', 3)], [{ keyId: CHECKOUT, requests: 3 }]));
    await settle();
    const component = fixture.componentInstance as unknown as { keyOptions(): Array<{ id: string; label: string }> };
    expect(component.keyOptions()).toEqual([{ id: CHECKOUT, label: `Checkout server (${CHECKOUT})` }]);

    page().querySelector<HTMLButtonElement>('[data-testid="traffic-csv"]')!.click();
    const csv = http.expectOne((r) => r.url === '/v1/usage/export');
    expect(csv.request.params.get('from')).toBe('2026-11-03');
    expect(csv.request.params.get('to')).toBe('2026-12-02');
    expect(csv.request.responseType).toBe('blob');
  });
});
