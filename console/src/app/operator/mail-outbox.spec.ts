import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { afterEach, describe, expect, it } from 'vitest';

import type { OutboxMessage } from '../core/api-types.js';
import { provideConsoleIcons } from '../core/console-icons.js';
import { MailOutbox } from './mail-outbox.js';

const origin = globalThis.location.origin;
// Shaped as api/services/members.ts writes an invitation; the address is invented.
const INVITATION: OutboxMessage = {
  id: '9e4c2b71-6a3d-4f85-b0e2-8d1f7c5a3b60',
  to: 'rowan@harborlane.test',
  subject: 'You are invited to Harbor Lane Lighting on Treadwise',
  text: `Accept the invitation here:\n${origin}/accept-invitation?token=Xh2bQ9mV\n\nRead more at https://docs.treadwise.test/team.`,
  html: '<p>never rendered</p><img src=x onerror="alert(1)">',
  createdAt: '2026-12-01T09:30:00.000Z',
};

describe('MailOutbox', () => {
  let fixture: ComponentFixture<MailOutbox>;
  let http: HttpTestingController;

  async function render(): Promise<void> {
    TestBed.configureTestingModule({ providers: [provideZonelessChangeDetection(), provideHttpClient(), provideHttpClientTesting(), provideConsoleIcons()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(MailOutbox);
    await fixture.whenStable();
  }

  afterEach(() => http.verify());
  const page = () => fixture.nativeElement as HTMLElement;

  it('opens a message and makes its links clickable: this console in place, other sites in a new tab', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/dev/outbox').flush({ items: [INVITATION], nextCursor: null });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="outbox-body"]')).toBeNull();

    page().querySelector<HTMLButtonElement>('[data-testid="outbox-message"]')!.click();
    await fixture.whenStable();
    const links = [...page().querySelectorAll<HTMLAnchorElement>('[data-testid="outbox-link"]')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual([`${origin}/accept-invitation?token=Xh2bQ9mV`, 'https://docs.treadwise.test/team']);
    expect(links.map((a) => a.getAttribute('target'))).toEqual([null, '_blank']);
    expect(page().querySelector('[data-testid="outbox-body"]')?.textContent).toContain('Accept the invitation here:');
    expect(page().querySelector('[data-testid="outbox-body"] img')).toBeNull(); // the HTML part is never rendered
  });

  it('says so when no message was sent', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/dev/outbox').flush({ items: [], nextCursor: null });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="outbox-empty"]')).not.toBeNull();
  });

  it('shows the problem detail when the outbox cannot be read (SMTP configured: the route does not exist)', async () => {
    await render();
    http.expectOne((r) => r.url === '/v1/dev/outbox').flush({ title: 'Not found', status: 404, detail: 'No route GET /v1/dev/outbox.' }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(page().querySelector('[data-testid="outbox-failed"]')?.textContent).toContain('No route GET /v1/dev/outbox.');
  });
});
