import { HttpClient, HttpErrorResponse } from '@angular/common/http';
import { DestroyRef, Injectable, computed, inject, signal } from '@angular/core';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { anonymous } from './anonymous.js';
import type { Session, SignInRequest, SwitchedOrganization } from './api-types.js';
import { CLOCK } from './clock.js';
import { REFRESH_TOKEN_STORE } from './refresh-token-store.js';
import { SESSION_CHANNEL, type SessionMessage } from './session-channel.js';
import { SESSION_LOCK } from './session-lock.js';
import { type SessionState, stateOf } from './session-state.js';

// Renew a minute before the access token runs out, so a call in flight never meets an expired one.
const RENEW_BEFORE_EXPIRY_MS = 60_000;
const MIN_RENEW_DELAY_MS = 5_000;

/**
 * The console's sign-in: the access token in memory, the refresh token in a store shared by tabs,
 * and one refresh at a time across every tab (a refresh token works once; spending it twice makes
 * the API end the whole sign-in).
 */
@Injectable({ providedIn: 'root' })
export class Auth {
  private readonly http = inject(HttpClient);
  private readonly router = inject(Router);
  private readonly now = inject(CLOCK);
  private readonly store = inject(REFRESH_TOKEN_STORE);
  private readonly lock = inject(SESSION_LOCK);
  private readonly channel = inject(SESSION_CHANNEL);

  private readonly state = signal<SessionState | null>(null);
  /** Bumped whenever this tab gets a new access token, from the API or from another tab. */
  private generation = 0;
  private pendingRefresh: Promise<boolean> | null = null;
  private renewTimer: ReturnType<typeof setTimeout> | undefined;

  readonly session = this.state.asReadonly();
  readonly signedIn = computed(() => this.state() !== null);
  readonly role = computed(() => this.state()?.role ?? null);
  readonly organization = computed(() => this.state()?.organization ?? null);
  readonly user = computed(() => this.state()?.user ?? null);

  constructor() {
    this.channel.listen((message) => this.hear(message));
    inject(DestroyRef).onDestroy(() => clearTimeout(this.renewTimer));
  }

  accessToken(): string | null {
    return this.state()?.accessToken ?? null;
  }

  async signIn(request: SignInRequest): Promise<void> {
    const session = await firstValueFrom(this.http.post<Session>('/v1/auth/sign-in', request, anonymous()));
    this.adopt(session);
  }

  /** Adopts the session an accepted invitation answers with. */
  startSession(session: Session): void {
    this.adopt(session);
  }

  /** Restores the sign-in after a page load from the stored refresh token; false when there is none. */
  async restore(): Promise<boolean> {
    if (this.state()) return true;
    if (!this.store.read()) return false;
    try {
      return await this.refresh();
    } catch {
      return false; // the API could not be reached: show the sign-in page rather than hang
    }
  }

  /**
   * Gets a new access token. Concurrent callers in this tab share one refresh; other tabs wait for
   * the lock, and a tab that got a new token from another tab meanwhile skips its own.
   */
  refresh(): Promise<boolean> {
    this.pendingRefresh ??= this.refreshUnderLock().finally(() => (this.pendingRefresh = null));
    return this.pendingRefresh;
  }

  private refreshUnderLock(): Promise<boolean> {
    const generationBefore = this.generation;
    return this.lock.run(async () => {
      if (this.generation !== generationBefore && this.state()) return true;
      // Read inside the lock: another tab may have spent and replaced the token while we waited.
      const refreshToken = this.store.read();
      if (!refreshToken) {
        this.end();
        return false;
      }
      try {
        const session = await firstValueFrom(this.http.post<Session>('/v1/auth/refresh', { refreshToken }, anonymous()));
        this.adopt(session);
        return true;
      } catch (error) {
        // 401: the API no longer honours the token (used, revoked, expired). Anything else
        // (network down, 5xx) leaves the sign-in alone so a later try can still succeed.
        if (error instanceof HttpErrorResponse && (error.status === 401 || error.status === 400)) {
          const midSession = this.state() !== null; // on a page load, the route guard sends the visitor on
          this.end();
          this.channel.post({ type: 'signed-out' });
          if (midSession) void this.router.navigateByUrl('/sign-in');
          return false;
        }
        throw error;
      }
    });
  }

  async switchOrganization(organization: string): Promise<void> {
    const switched = await firstValueFrom(this.http.post<SwitchedOrganization>('/v1/auth/switch-organization', { organization }));
    const current = this.state();
    if (!current) return;
    this.setState({
      ...current,
      accessToken: switched.accessToken,
      accessTokenExpiresAt: switched.accessTokenExpiresAt,
      organization: switched.organization,
      role: switched.role,
    });
  }

  async signOut(): Promise<void> {
    const refreshToken = this.store.read();
    this.end();
    this.channel.post({ type: 'signed-out' });
    if (refreshToken) {
      // Best effort: the local sign-in is gone either way, and the token dies with its expiry.
      await firstValueFrom(this.http.post('/v1/auth/sign-out', { refreshToken }, anonymous())).catch(() => undefined);
    }
    await this.router.navigateByUrl('/sign-in');
  }

  private adopt(session: Session): void {
    this.store.write(session.refreshToken);
    this.setState(stateOf(session));
  }

  private setState(state: SessionState): void {
    this.state.set(state);
    this.generation++;
    this.scheduleRenewal(state.accessTokenExpiresAt);
    this.channel.post({ type: 'renewed', state });
  }

  private hear(message: SessionMessage): void {
    if (message.type === 'renewed') {
      this.state.set(message.state);
      this.generation++;
      this.scheduleRenewal(message.state.accessTokenExpiresAt);
      return;
    }
    if (this.state()) {
      this.end();
      void this.router.navigateByUrl('/sign-in');
    }
  }

  private end(): void {
    clearTimeout(this.renewTimer);
    this.store.clear();
    this.state.set(null);
  }

  private scheduleRenewal(expiresAt: string): void {
    clearTimeout(this.renewTimer);
    const delay = Math.max(Date.parse(expiresAt) - this.now().getTime() - RENEW_BEFORE_EXPIRY_MS, MIN_RENEW_DELAY_MS);
    this.renewTimer = setTimeout(() => void this.refresh().catch(() => undefined), delay);
  }
}
