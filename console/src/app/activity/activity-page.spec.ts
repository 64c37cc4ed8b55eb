import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { AuditEvent, Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { ActivityPage } from './activity-page.js';

const event = (id: string, action: string, data: AuditEvent['data'] = null): AuditEvent => ({
  id,
  action,
  actor: { type: 'user', id: 'u-mira' },
  target: { type: 'api_key', id: 'k-1' },
  requestId: 'r-1',
  ip: '127.0.0.1',
  data,
  createdAt: '2026-12-02T09:00:00.000Z',
});

describe('ActivityPage', () => {
  let fixture: ComponentFixture<ActivityPage>;
  let http: HttpTestingController;

  async function render(role: Role): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: Auth, useValue: { role: signal<Role | null>(role) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ActivityPage);
    await fixture.whenStable();
    if (role === 'admin') {
      http.expectOne((r) => r.url === '/v1/members').flush({ items: [{ id: 'm-1', userId: 'u-mira', email: 'mira@harborlane.test', name: 'Mira', role: 'admin', createdAt: '2026-11-01T08:00:00.000Z' }], nextCursor: null });
    }
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const component = () => fixture.componentInstance as unknown as { filterBy(a: string): void; next(): void; previous(): void };
  const answer = async (items: AuditEvent[], nextCursor: string | null, match: (params: URLSearchParams) => boolean = () => true) => {
    const req = http.expectOne((r) => r.url === '/v1/audit-events' && match(new URLSearchParams(r.params.toString())));
    req.flush({ items, nextCursor });
    await fixture.whenStable();
  };

  it('lists events with their actor, target and data', async () => {
    await render('admin');
    await answer([event('e1', 'api_key.created', { name: 'Checkout server', kind: 'server' })], null);
    const item = page().querySelector('[data-action="api_key.created"]')!;
    expect(item.textContent).toContain('api key created');
    expect(item.textContent).toContain('by Mira (mira@harborlane.test)');
    expect(item.textContent).toContain('Checkout server');
  });

  it('filters by action, starting again from the first page', async () => {
    await render('admin');
    await answer([event('e1', 'auth.signed_in')], 'c2');
    component().next();
    await answer([event('e2', 'auth.signed_in')], null, (p) => p.get('cursor') === 'c2');
    component().filterBy('member.invited');
    await answer([], null, (p) => p.get('action') === 'member.invited' && !p.has('cursor'));
    expect(page().querySelector('[data-testid="activity-empty"]')?.textContent).toContain('for this action');
  });

  it('pages older and back to newer with the cursors the API gave', async () => {
    await render('admin');
    await answer([event('e1', 'auth.signed_in')], 'c2');
    expect(page().querySelector<HTMLButtonElement>('[data-testid="activity-newer"]')!.disabled).toBe(true);
    page().querySelector<HTMLButtonElement>('[data-testid="activity-older"]')!.click();
    await answer([event('e2', 'auth.signed_out')], null, (p) => p.get('cursor') === 'c2');
    expect(page().querySelector<HTMLButtonElement>('[data-testid="activity-older"]')!.disabled).toBe(true);
    expect(page().textContent).toContain('Page 2');
    page().querySelector<HTMLButtonElement>('[data-testid="activity-newer"]')!.click();
    await answer([event('e1', 'auth.signed_in')], 'c2', (p) => !p.has('cursor'));
    expect(page().textContent).toContain('Page 1');
  });

  it('shows the problem detail when the trail cannot be read', async () => {
    await render('admin');
    http.expectOne((r) => r.url === '/v1/audit-events').flush({ title: 'Bad request', status: 400, detail: 'The cursor is not one this API issued.' }, { status: 400, statusText: 'Bad Request' });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="activity-failed"]')?.textContent).toContain('The cursor is not one this API issued.');
  });

  it('asks the API nothing for a role that may not read the trail', async () => {
    await render('estimator');
    http.expectNone((r) => r.url === '/v1/audit-events');
    http.expectNone((r) => r.url === '/v1/members');
    expect(page().querySelector('[data-testid="activity-not-allowed"]')).not.toBeNull();
  });
});
