import { OverlayContainer } from '@angular/cdk/overlay';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { computed, provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { afterEach, describe, expect, it, vi } from 'vitest';

import type { OrganizationRef, Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import type { SessionState } from '../core/session-state.js';
import { ConsoleShell } from './console-shell.js';

// Invented organisations of the demo scenario.
const HARBOR: OrganizationRef = { id: '0b7e4f1a-52c3-4d8e-9f60-1a2b3c4d5e6f', slug: 'harbor-lane', name: 'Harbor Lane Lighting' };
const KESTREL: OrganizationRef = { id: '1c8f5a2b-63d4-4e9f-a071-2b3c4d5e6f70', slug: 'kestrel-finch', name: 'Kestrel & Finch Builders' };

function fakeAuth(role: Role, operator = false) {
  const state = signal<SessionState>({
    accessToken: 'access-1',
    accessTokenExpiresAt: '2026-12-02T09:15:00.000Z',
    user: { id: '6c1d2e3f-4a5b-4c6d-8e7f-901234567890', email: 'ops@treadwise.test', name: null, operator },
    organization: HARBOR,
    memberships: operator ? [] : [{ organization: HARBOR, role }],
    role,
  });
  return {
    session: state.asReadonly(),
    user: computed(() => state().user),
    organization: computed(() => state().organization),
    role: computed(() => state().role),
    switchOrganization: vi.fn(async () => undefined),
    signOut: vi.fn(async () => undefined),
  };
}

describe('ConsoleShell', () => {
  let fixture: ComponentFixture<ConsoleShell>;
  let http: HttpTestingController;

  async function render(auth: ReturnType<typeof fakeAuth>): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter([{ path: '**', children: [] }]),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: Auth, useValue: auth },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ConsoleShell);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const shell = () => fixture.nativeElement as HTMLElement;
  const sections = () => [...shell().querySelectorAll('mat-nav-list a')].map((a) => a.textContent?.trim());

  it('shows the organisation and the role in the toolbar', async () => {
    await render(fakeAuth('estimator'));
    expect(shell().querySelector('[data-testid="organization"]')?.textContent).toContain(HARBOR.name);
    expect(shell().querySelector('[data-testid="role"]')?.textContent?.trim()).toBe('estimator');
  });

  it('lists the keys section for an admin and hides it from a viewer', async () => {
    await render(fakeAuth('admin'));
    // Other sections come and go with features; the keys section is the one only admins see.
    expect(sections()).toContain('Keys');
    expect(sections()).toContain('Status');
    TestBed.resetTestingModule();
    await render(fakeAuth('viewer'));
    expect(sections()).not.toContain('Keys');
    expect(sections()).toContain('Status');
  });

  it('lets the operator pick any organisation and switches to it', async () => {
    const auth = fakeAuth('admin', true);
    await render(auth);
    (shell().querySelector('[data-testid="organization"]') as HTMLButtonElement).click();
    await fixture.whenStable();
    http.expectOne((req) => req.url === '/v1/organizations').flush({
      items: [
        { ...HARBOR, planId: 'shop', createdAt: '2026-11-01T08:00:00.000Z', updatedAt: '2026-11-01T08:00:00.000Z' },
        { ...KESTREL, planId: 'partner', createdAt: '2026-11-01T08:00:00.000Z', updatedAt: '2026-11-01T08:00:00.000Z' },
      ],
      nextCursor: null,
    });
    await fixture.whenStable();
    const items = [...TestBed.inject(OverlayContainer).getContainerElement().querySelectorAll<HTMLButtonElement>('[mat-menu-item]')];
    expect(items.map((i) => i.textContent?.trim())).toEqual([HARBOR.name, KESTREL.name]);
    items[1]!.click();
    await fixture.whenStable();
    expect(auth.switchOrganization).toHaveBeenCalledWith('kestrel-finch');
  });
});
