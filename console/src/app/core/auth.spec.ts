import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { EnvironmentInjector, createEnvironmentInjector, provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

import { Auth } from './auth.js';
import { CLOCK } from './clock.js';
import { REFRESH_TOKEN_STORE, type RefreshTokenStore, memoryRefreshTokenStore } from './refresh-token-store.js';
import { SESSION_CHANNEL } from './session-channel.js';
import { FakeSessionBus, sessionAnswer } from './session-fakes.js';
import { SESSION_LOCK, inTabLock } from './session-lock.js';

const NOW = new Date('2026-12-02T09:00:00.000Z');
// Let the lock's queued tasks and the HTTP calls they make reach the testing backend.
const settle = () => new Promise((resolve) => setTimeout(resolve, 0));

describe('Auth: one refresh at a time across tabs', () => {
  let store: RefreshTokenStore;
  let bus: FakeSessionBus;
  let http: HttpTestingController;
  let tabA: Auth;
  let tabB: Auth;

  beforeEach(() => {
    // Two tabs share what a browser shares between them: localStorage, the lock and the channel.
    store = memoryRefreshTokenStore('refresh-1');
    bus = new FakeSessionBus();
    const lock = inTabLock();
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter([{ path: '**', children: [] }]), // signing out navigates to /sign-in
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: CLOCK, useValue: () => NOW },
        { provide: REFRESH_TOKEN_STORE, useValue: store },
        { provide: SESSION_LOCK, useValue: lock },
        { provide: SESSION_CHANNEL, useFactory: () => bus.channel() },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    tabA = TestBed.inject(Auth);
    // A second Auth with its own channel end: the other tab.
    const other = createEnvironmentInjector(
      [{ provide: SESSION_CHANNEL, useFactory: () => bus.channel() }, Auth],
      TestBed.inject(EnvironmentInjector),
    );
    tabB = other.get(Auth);
  });

  afterEach(() => http.verify());

  it('spends the refresh token once when two tabs refresh together, and both get the new access token', async () => {
    const both = Promise.all([tabA.refresh(), tabB.refresh()]);
    await settle();

    const calls = http.match('/v1/auth/refresh');
    expect(calls).toHaveLength(1);
    expect(calls[0]!.request.body).toEqual({ refreshToken: 'refresh-1' });
    calls[0]!.flush(sessionAnswer({ accessToken: 'access-2', refreshToken: 'refresh-2' }));

    expect(await both).toEqual([true, true]);
    await settle();
    http.expectNone('/v1/auth/refresh'); // the waiting tab used the broadcast token instead
    expect(tabA.accessToken()).toBe('access-2');
    expect(tabB.accessToken()).toBe('access-2');
    expect(store.read()).toBe('refresh-2');
  });

  it('uses the token the other tab stored, never the spent one, when the broadcast is late', async () => {
    bus.hold();
    const first = tabA.refresh();
    const second = tabB.refresh();
    await settle();
    http.expectOne('/v1/auth/refresh').flush(sessionAnswer({ accessToken: 'access-2', refreshToken: 'refresh-2' }));
    await first;
    await settle();

    const next = http.expectOne('/v1/auth/refresh');
    expect(next.request.body).toEqual({ refreshToken: 'refresh-2' }); // read inside the lock
    next.flush(sessionAnswer({ accessToken: 'access-3', refreshToken: 'refresh-3' }));
    expect(await second).toBe(true);
    bus.release();
    expect(store.read()).toBe('refresh-3');
  });

  it('shares one refresh between calls in the same tab', async () => {
    const calls = Promise.all([tabA.refresh(), tabA.refresh(), tabA.refresh()]);
    await settle();
    http.expectOne('/v1/auth/refresh').flush(sessionAnswer({ accessToken: 'access-2', refreshToken: 'refresh-2' }));
    expect(await calls).toEqual([true, true, true]);
  });

  it('signs every tab out when the API refuses the refresh token', async () => {
    const signIn = tabA.signIn({ email: 'mira@harborlane.test', password: 'treadwise-demo' });
    http.expectOne('/v1/auth/sign-in').flush(sessionAnswer({ refreshToken: 'refresh-1' }));
    await signIn;
    expect(tabB.signedIn()).toBe(true); // heard the sign-in

    const refused = tabA.refresh();
    await settle();
    http
      .expectOne('/v1/auth/refresh')
      .flush({ title: 'Unauthenticated', status: 401, detail: 'Sign in again.', code: 'invalid_token' }, { status: 401, statusText: 'Unauthorized' });
    expect(await refused).toBe(false);
    await settle();
    expect(TestBed.inject(Router).url).toBe('/sign-in'); // signed out mid-session: back to the sign-in page
    expect(tabA.signedIn()).toBe(false);
    expect(tabB.signedIn()).toBe(false);
    expect(store.read()).toBeNull();
  });

  it('keeps the sign-in when the refresh fails for another reason (the API unreachable)', async () => {
    const attempt = tabA.refresh();
    await settle();
    http.expectOne('/v1/auth/refresh').error(new ProgressEvent('error'));
    await expect(attempt).rejects.toBeTruthy();
    expect(store.read()).toBe('refresh-1');
  });

  it('takes the role in the organisation acted in from the session', async () => {
    const done = tabA.refresh();
    await settle();
    http.expectOne('/v1/auth/refresh').flush(sessionAnswer({ role: 'viewer' }));
    await done;
    expect(tabA.role()).toBe('viewer');
    expect(tabB.role()).toBe('viewer');
  });
});
