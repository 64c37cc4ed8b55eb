import { OverlayContainer } from '@angular/cdk/overlay';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection, signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { afterEach, describe, expect, it } from 'vitest';

import type { AuditEvent, Member, Role } from '../core/api-types.js';
import { Auth } from '../core/auth.js';
import { CLOCK } from '../core/clock.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import { TeamPage } from './team-page.js';

// Members in the API's Member shape; the names are demo-scenario.md's invented ones.
const MIRA: Member = { id: '1a2b3c4d-0000-4000-8000-000000000001', userId: 'u-mira', email: 'mira@harborlane.test', name: 'Mira', role: 'admin', createdAt: '2026-11-01T08:00:00.000Z' };
const THEO: Member = { id: '1a2b3c4d-0000-4000-8000-000000000002', userId: 'u-theo', email: 'theo@harborlane.test', name: 'Theo', role: 'estimator', createdAt: '2026-11-02T08:00:00.000Z' };
const INVITED: AuditEvent = {
  id: 'ev-1',
  action: 'member.invited',
  actor: { type: 'user', id: 'u-mira' },
  target: { type: 'invitation', id: 'inv-1' },
  requestId: null,
  ip: null,
  data: { email: 'rowan@harborlane.test', role: 'viewer', expiresAt: '2026-12-08T09:00:00.000Z' },
  createdAt: '2026-12-01T09:00:00.000Z',
};

describe('TeamPage', () => {
  let fixture: ComponentFixture<TeamPage>;
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
        { provide: Auth, useValue: { role: signal<Role | null>(role), user: signal({ id: 'u-mira', email: MIRA.email, name: 'Mira', operator: false }) } },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(TeamPage);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());

  const page = () => fixture.nativeElement as HTMLElement;
  const overlay = () => TestBed.inject(OverlayContainer).getContainerElement();
  const settle = async () => {
    await new Promise((resolve) => setTimeout(resolve, 0));
    await fixture.whenStable();
  };

  async function listed(members: Member[], invited: AuditEvent[] = []): Promise<void> {
    http.expectOne((req) => req.url === '/v1/members').flush({ items: members, nextCursor: null });
    await settle();
    http.expectOne((req) => req.url === '/v1/audit-events' && req.params.get('action') === 'member.invited').flush({ items: invited, nextCursor: null });
    http.expectOne((req) => req.url === '/v1/audit-events' && req.params.get('action') === 'member.joined').flush({ items: [], nextCursor: null });
    await settle();
  }

  it('lists members with their roles and the invitations still waiting', async () => {
    await render('admin');
    await listed([MIRA, THEO], [INVITED]);
    const rows = [...page().querySelectorAll('tr[data-member]')].map((r) => r.getAttribute('data-member'));
    expect(rows).toEqual([MIRA.email, THEO.email]);
    expect(page().querySelector('tr[data-member="theo@harborlane.test"] [data-testid="member-role"]')?.textContent).toContain('estimator');
    expect(page().querySelector('[data-invitation="rowan@harborlane.test"]')?.textContent).toContain('viewer');
  });

  it.each<Role>(['estimator', 'viewer'])('asks nothing of the API for a %s and offers no changes', async (role) => {
    await render(role);
    http.expectNone('/v1/members');
    expect(page().querySelector('[data-testid="team-not-allowed"]')).not.toBeNull();
    expect(page().querySelector('[data-testid="invite-submit"]')).toBeNull();
  });

  it('shows the problem detail when the team cannot be loaded', async () => {
    await render('admin');
    http.expectOne('/v1/members?limit=100').flush({ title: 'Forbidden', status: 403, detail: 'Needs the admin role.' }, { status: 403, statusText: 'Forbidden' });
    await settle();
    expect(page().querySelector('[data-testid="team-failed"]')?.textContent).toContain('Needs the admin role.');
  });

  it('says so when no invitation is waiting', async () => {
    await render('admin');
    await listed([MIRA]);
    expect(page().querySelector('[data-testid="invitations-empty"]')).not.toBeNull();
  });

  it('keeps a malformed address beside its field and sends nothing', async () => {
    await render('admin');
    await listed([MIRA]);
    const email = page().querySelector<HTMLInputElement>('[data-testid="invite-email"]')!;
    email.value = 'rowan at harborlane';
    email.dispatchEvent(new Event('input'));
    (page().querySelector('[data-testid="invite-submit"]') as HTMLButtonElement).click();
    await settle();
    http.expectNone('/v1/members/invitations');
    expect(page().querySelector('mat-error')?.textContent).toContain('does not look like an e-mail address');
  });

  it('invites by e-mail with a role and lists the invitation as waiting', async () => {
    await render('admin');
    await listed([MIRA]);
    const email = page().querySelector<HTMLInputElement>('[data-testid="invite-email"]')!;
    email.value = 'rowan@harborlane.test';
    email.dispatchEvent(new Event('input'));
    (page().querySelector('[data-testid="invite-submit"]') as HTMLButtonElement).click();
    await settle();
    const sent = http.expectOne((req) => req.method === 'POST' && req.url === '/v1/members/invitations');
    expect(sent.request.body).toEqual({ email: 'rowan@harborlane.test', role: 'viewer' });
    expect(sent.request.headers.get('Idempotency-Key')).toMatch(/^[0-9a-f]{32}$/);
    sent.flush({ invitation: { id: 'inv-2', email: 'rowan@harborlane.test', role: 'viewer', expiresAt: '2026-12-09T10:00:00.000Z' }, requestId: 'r-1' }, { status: 201, statusText: 'Created' });
    await settle();
    expect(page().querySelector('[data-invitation="rowan@harborlane.test"]')).not.toBeNull();
    expect(email.value).toBe('');
  });

  it('shows a refusal beside the invitation form', async () => {
    await render('admin');
    await listed([MIRA]);
    const email = page().querySelector<HTMLInputElement>('[data-testid="invite-email"]')!;
    email.value = 'theo@harborlane.test';
    email.dispatchEvent(new Event('input'));
    (page().querySelector('[data-testid="invite-submit"]') as HTMLButtonElement).click();
    await settle();
    http
      .expectOne('/v1/members/invitations')
      .flush({ title: 'Conflict', status: 409, code: 'already_member', detail: 'theo@harborlane.test is already a member of this organisation.' }, { status: 409, statusText: 'Conflict' });
    await settle();
    expect(page().querySelector('[data-testid="invite-failure"]')?.textContent).toContain('already a member');
  });

  it('changes a role, and puts the old one back when the API refuses', async () => {
    await render('admin');
    await listed([MIRA, THEO]);
    const component = fixture.componentInstance as unknown as { changeRole(m: Member, r: Role): Promise<void> };

    const done = component.changeRole(THEO, 'viewer');
    http.expectOne((req) => req.method === 'PATCH' && req.url === `/v1/members/${THEO.id}`).flush({ ...THEO, role: 'viewer' });
    await done;
    await settle();
    expect(page().querySelector('tr[data-member="theo@harborlane.test"] [data-testid="member-role"]')?.textContent).toContain('viewer');

    const refused = component.changeRole(MIRA, 'viewer');
    http
      .expectOne(`/v1/members/${MIRA.id}`)
      .flush({ title: 'Conflict', status: 409, code: 'last_admin', detail: 'The last admin cannot be demoted.' }, { status: 409, statusText: 'Conflict' });
    await refused;
    await settle();
    expect(page().querySelector('tr[data-member="mira@harborlane.test"] [data-testid="member-role"]')?.textContent).toContain('admin');
    expect(overlay().textContent).toContain('The last admin cannot be demoted.');
  });

  it('names the member in the removal confirmation and removes them from the list', async () => {
    await render('admin');
    await listed([MIRA, THEO]);
    (page().querySelector('tr[data-member="theo@harborlane.test"] [data-testid="remove-member"]') as HTMLButtonElement).click();
    await settle();
    expect(overlay().querySelector('[data-testid="remove-title"]')?.textContent).toContain('Theo');
    (overlay().querySelector('[data-testid="remove-confirm"]') as HTMLButtonElement).click();
    await settle();
    http.expectOne((req) => req.method === 'DELETE' && req.url === `/v1/members/${THEO.id}`).flush(null, { status: 204, statusText: 'No Content' });
    await settle();
    expect(page().querySelector('tr[data-member="theo@harborlane.test"]')).toBeNull();
  });
});
