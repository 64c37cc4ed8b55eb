import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { afterEach, describe, expect, it } from 'vitest';

import { PasswordResetConfirmPage } from './password-reset-confirm.js';

describe('PasswordResetConfirmPage', () => {
  let http: HttpTestingController;
  let page: HTMLElement;
  let fixture: ComponentFixture<unknown>;

  async function open(url: string): Promise<void> {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter([{ path: 'reset-password', component: PasswordResetConfirmPage }, { path: '**', children: [] }]),
        provideHttpClient(),
        provideHttpClientTesting(),
      ],
    });
    http = TestBed.inject(HttpTestingController);
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(url, PasswordResetConfirmPage);
    fixture = harness.fixture;
    page = harness.routeNativeElement as HTMLElement;
  }

  afterEach(() => http.verify());

  async function type(index: number, value: string): Promise<void> {
    const input = page.querySelectorAll('input')[index] as HTMLInputElement;
    input.value = value;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }

  async function submit(): Promise<void> {
    (page.querySelector('button[type="submit"]') as HTMLButtonElement).click();
    await fixture.whenStable();
  }

  it('refuses a password shorter than the API accepts, and sends nothing', async () => {
    await open('/reset-password?token=t0k3n');
    await type(0, 'short');
    await type(1, 'short');
    await submit();
    expect(page.textContent).toContain('At least 10 characters'); // PASSWORD_MIN_LENGTH in shared/schemas/accounts.ts
    http.expectNone('/v1/auth/password-reset/confirm');
  });

  it('refuses two different passwords', async () => {
    await open('/reset-password?token=t0k3n');
    await type(0, 'a-long-new-passphrase');
    await type(1, 'a-long-new-passphrasf');
    await submit();
    expect(page.textContent).toContain('The two passwords differ.');
    http.expectNone('/v1/auth/password-reset/confirm');
  });

  it('sends the token from the link with the new password', async () => {
    await open('/reset-password?token=t0k3n');
    await type(0, 'a-long-new-passphrase');
    await type(1, 'a-long-new-passphrase');
    await submit();
    const call = http.expectOne('/v1/auth/password-reset/confirm');
    expect(call.request.body).toEqual({ token: 't0k3n', password: 'a-long-new-passphrase' });
    call.flush(null, { status: 204, statusText: 'No Content' });
    await new Promise((resolve) => setTimeout(resolve, 0)); // the page awaits the answer as a promise
    await fixture.whenStable();
    expect(page.querySelector('[data-testid="reset-done"]')).not.toBeNull();
  });

  it('says the link is needed when the page is opened without one', async () => {
    await open('/reset-password');
    expect(page.textContent).toContain('needs the link from the e-mail');
    expect(page.querySelector('form')).toBeNull();
  });
});
