import { InjectionToken } from '@angular/core';

/**
 * Where the refresh token lives between page loads. The access token stays in memory only; the
 * refresh token has to survive a reload and be shared by tabs, so it sits in localStorage.
 */
export interface RefreshTokenStore {
  read(): string | null;
  write(token: string): void;
  clear(): void;
}

const STORAGE_KEY = 'treadwise.refresh-token';

export function localRefreshTokenStore(storage: Storage | undefined = globalThis.localStorage): RefreshTokenStore {
  return {
    read: () => storage?.getItem(STORAGE_KEY) ?? null,
    write: (token) => storage?.setItem(STORAGE_KEY, token),
    clear: () => storage?.removeItem(STORAGE_KEY),
  };
}

/** A store held in memory: for specs, where two fake tabs share one instance. */
export function memoryRefreshTokenStore(initial: string | null = null): RefreshTokenStore {
  let token = initial;
  return {
    read: () => token,
    write: (next) => (token = next),
    clear: () => (token = null),
  };
}

export const REFRESH_TOKEN_STORE = new InjectionToken<RefreshTokenStore>('REFRESH_TOKEN_STORE', {
  providedIn: 'root',
  factory: () => localRefreshTokenStore(),
});
