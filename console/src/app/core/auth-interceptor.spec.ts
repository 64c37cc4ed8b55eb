import { HttpClient, provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { provideZonelessChangeDetection } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';

import { Auth } from './auth.js';
import { authInterceptor } from './auth-interceptor.js';
import { REFRESH_TOKEN_STORE, memoryRefreshTokenStore } from './refresh-token-store.js';
import { SESSION_CHANNEL } from './session-channel.js';
import { FakeSessionBus, sessionAnswer } from './session-fakes.js';
import { SESSION_LOCK, inTabLock } from './session-lock.js';

const settle = () => new Promise((resolve) => setTimeout(resolve, 0));
const UNAUTHORIZED = { status: 401, statusText: 'Unauthorized' };
const EXPIRED = { title: 'Unauthenticated', status: 401, detail: 'The access token has expired.', code: 'credential_expired' };

describe('authInterceptor', () => {
  let http: HttpTestingController;
  let client: HttpClient;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideZonelessChangeDetection(),
        provideRouter([{ path: '**', children: [] }]), // signing out navigates to /sign-in
        provideHttpClient(withInterceptors([authInterceptor])),
        provideHttpClientTesting(),
        { provide: REFRESH_TOKEN_STORE, useValue: memoryRefreshTokenStore() },
        { provide: SESSION_LOCK, useValue: inTabLock() },
        { provide: SESSION_CHANNEL, useFactory: () => new FakeSessionBus().channel() },
      ],
    });
    http = TestBed.inject(HttpTestingController);
    client = TestBed.inject(HttpClient);
    const signIn = TestBed.inject(Auth).signIn({ email: 'mira@harborlane.test', password: 'treadwise-demo' });
    const call = http.expectOne('/v1/auth/sign-in');
    expect(call.request.headers.has('Authorization')).toBe(false); // sign-in carries no bearer
    call.flush(sessionAnswer({ accessToken: 'access-1', refreshToken: 'refresh-1' }));
    await signIn;
  });

  afterEach(() => http.verify());

  it('sends the access token as a bearer', async () => {
    const answer = firstValueFrom(client.get('/v1/keys'));
    const call = http.expectOne('/v1/keys');
    expect(call.request.headers.get('Authorization')).toBe('Bearer access-1');
    call.flush({ items: [], nextCursor: null });
    await answer;
  });

  it('refreshes once after a 401 and retries with the new token', async () => {
    const answer = firstValueFrom(client.get('/v1/keys'));
    http.expectOne('/v1/keys').flush(EXPIRED, UNAUTHORIZED);
    await settle();
    http.expectOne('/v1/auth/refresh').flush(sessionAnswer({ accessToken: 'access-2', refreshToken: 'refresh-2' }));
    await settle();
    const retry = http.expectOne('/v1/keys');
    expect(retry.request.headers.get('Authorization')).toBe('Bearer access-2');
    retry.flush({ items: [], nextCursor: null });
    expect(await answer).toEqual({ items: [], nextCursor: null });
  });

  it('gives up after one retry: a second 401 reaches the caller', async () => {
    const answer = firstValueFrom(client.get('/v1/keys'));
    http.expectOne('/v1/keys').flush(EXPIRED, UNAUTHORIZED);
    await settle();
    http.expectOne('/v1/auth/refresh').flush(sessionAnswer({ accessToken: 'access-2', refreshToken: 'refresh-2' }));
    await settle();
    http.expectOne('/v1/keys').flush(EXPIRED, UNAUTHORIZED);
    await expect(answer).rejects.toMatchObject({ status: 401 });
    http.expectNone('/v1/auth/refresh');
  });
});
