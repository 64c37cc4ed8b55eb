import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { beforeEach, describe, expect, it } from 'vitest';

import { AcceptInvitationPage } from './account/accept-invitation.js';
import { PasswordResetConfirmPage } from './account/password-reset-confirm.js';
import { SignInPage } from './account/sign-in-page.js';
import { routes } from './app.routes.js';
import { provideConsoleIcons } from './core/console-icons.js';
import { REFRESH_TOKEN_STORE, memoryRefreshTokenStore } from './core/refresh-token-store.js';

describe('console routes', () => {
  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter(routes),
        provideHttpClient(),
        provideHttpClientTesting(),
        provideConsoleIcons(),
        { provide: REFRESH_TOKEN_STORE, useValue: memoryRefreshTokenStore() }, // nobody signed in
      ],
    });
  });

  it.each([
    ['/', '/status'], // the home page is the status page
    ['/keys', '/keys'],
    ['/status', '/status'],
    ['/traffic', '/traffic'],
    ['/bench', '/bench'],
    ['/team', '/team'],
    ['/activity', '/activity'],
    ['/operator/outbox', '/operator/outbox'],
    ['/catalog', '/catalog'],
    ['/projects', '/projects'],
    ['/batches', '/batches'],
    ['/billing?checkout=done', '/billing?checkout=done'], // the payment provider sends the browser back here
  ])('sends a visitor who is not signed in from %s to sign in', async (url, next) => {
    const harness = await RouterTestingHarness.create();
    await harness.navigateByUrl(url, SignInPage);
    const router = TestBed.inject(Router);
    expect(router.url.startsWith('/sign-in')).toBe(true);
    expect(router.parseUrl(router.url).queryParamMap.get('next')).toBe(next); // back there after signing in
  });

  // The paths of the links the API e-mails (api/services/password-resets.ts and members.ts).
  it('opens the password page from the reset link', async () => {
    const harness = await RouterTestingHarness.create();
    expect(await harness.navigateByUrl('/reset-password?token=abc', PasswordResetConfirmPage)).toBeInstanceOf(PasswordResetConfirmPage);
  });

  it('opens the invitation page from the invitation link', async () => {
    const harness = await RouterTestingHarness.create();
    expect(await harness.navigateByUrl('/accept-invitation?token=abc', AcceptInvitationPage)).toBeInstanceOf(AcceptInvitationPage);
  });
});
