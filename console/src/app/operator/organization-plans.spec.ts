import { OverlayContainer } from '@angular/cdk/overlay';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { Organization } from '../core/api-types.js';
import { OrganizationPlans } from './organization-plans.js';
import { planChoices } from './plans.js';

// demo-scenario.md's invented organisations.
const HARBOR: Organization = { id: '7c1e9b52-3d4a-4e8f-b6a1-2f0d5c8e9a71', slug: 'harbor-lane', name: 'Harbor Lane Lighting', planId: 'shop', createdAt: '2026-11-01T08:00:00.000Z', updatedAt: '2026-11-01T08:00:00.000Z' };
const QUAYSIDE: Organization = { ...HARBOR, id: '2d3e4f50-6a7b-4c8d-9e0f-1a2b3c4d5e6f', slug: 'quayside-studio', name: 'Quayside Studio', planId: 'free' };

describe('OrganizationPlans', () => {
  let fixture: ComponentFixture<OrganizationPlans>;
  let http: HttpTestingController;

  async function render(): Promise<void> {
    TestBed.configureTestingModule({
      providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting(), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OrganizationPlans);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;
  const planOf = (slug: string) => page().querySelector(`tr[data-organization="${slug}"] [data-testid="organization-plan"]`)?.textContent;
  const changePlan = (o: Organization, plan: string) => (fixture.componentInstance as unknown as { changePlan(o: Organization, p: string): Promise<void> }).changePlan(o, plan);

  it('lists every organisation with its plan', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/organizations').flush({ items: [HARBOR, QUAYSIDE], nextCursor: null });
    await fixture.whenStable();
    expect(planOf('harbor-lane')).toContain('Shop');
    expect(planOf('quayside-studio')).toContain('Free');
  });

  it('moves an organisation to another plan with the operator PATCH, and keeps the old plan shown when refused', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/organizations').flush({ items: [HARBOR, QUAYSIDE], nextCursor: null });
    await fixture.whenStable();

    const done = changePlan(QUAYSIDE, 'partner');
    const patch = http.expectOne((r) => r.method === 'PATCH' && r.url === `/v1/organizations/${QUAYSIDE.id}`);
    expect(patch.request.body).toEqual({ planId: 'partner' });
    patch.flush({ ...QUAYSIDE, planId: 'partner' });
    await done;
    await fixture.whenStable();
    expect(planOf('quayside-studio')).toContain('Partner');

    const refused = changePlan(HARBOR, 'platform');
    http.expectOne(`/v1/organizations/${HARBOR.id}`).flush({ title: 'Bad request', status: 400, code: 'unknown_plan', detail: 'No plan platform.' }, { status: 400, statusText: 'Bad Request' });
    await refused;
    await fixture.whenStable();
    expect(planOf('harbor-lane')).toContain('Shop');
    expect(TestBed.inject(OverlayContainer).getContainerElement().textContent).toContain('No plan platform.');
  });

  it('shows the problem detail when the list cannot be loaded, and an empty state for none', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/organizations').flush({ title: 'Forbidden', status: 403, detail: 'Only the operator.' }, { status: 403, statusText: 'Forbidden' });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="organizations-failed"]')?.textContent).toContain('Only the operator.');
    (page().querySelector('[data-testid="organizations-failed"] button') as HTMLButtonElement).click();
    http.expectOne((r) => r.url === '/v1/organizations').flush({ items: [], nextCursor: null });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="organizations-empty"]')).not.toBeNull();
  });
});

describe('planChoices', () => {
  it('offers the starting plans, and a plan the console does not know when an organisation is on it', () => {
    expect(planChoices('shop').map((p) => p.id)).toEqual(['free', 'shop', 'partner', 'platform']);
    expect(planChoices('shop')[1]!.name).toBe('Shop · 50,000 units a month'); // migrations/0001: shop = 50 000 a month
    expect(planChoices('enterprise-2027').map((p) => p.id)).toEqual(['free', 'shop', 'partner', 'platform', 'enterprise-2027']);
  });
});
