import { InjectionToken } from '@angular/core';

/** Runs one task at a time across every tab of this origin that shares the lock. */
export interface SessionLock {
  run<T>(task: () => Promise<T>): Promise<T>;
}

// One name for every tab: a refresh token works once, so two tabs must never spend it together.
const LOCK_NAME = 'treadwise-session-refresh';

/** A lock over the Web Locks API, or within this tab only where a browser lacks it. */
export function browserSessionLock(locks: LockManager | undefined = globalThis.navigator?.locks): SessionLock {
  if (locks) return { run: <T>(task: () => Promise<T>) => locks.request(LOCK_NAME, () => task()) as Promise<T> };
  return inTabLock();
}

/** Serialises tasks inside one JavaScript realm (a fallback, and what specs share between fake tabs). */
export function inTabLock(): SessionLock {
  let tail: Promise<unknown> = Promise.resolve();
  return {
    run<T>(task: () => Promise<T>): Promise<T> {
      const result = tail.then(task, task);
      tail = result.catch(() => undefined);
      return result;
    },
  };
}

export const SESSION_LOCK = new InjectionToken<SessionLock>('SESSION_LOCK', {
  providedIn: 'root',
  factory: () => browserSessionLock(),
});
