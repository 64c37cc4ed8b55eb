import { HttpErrorResponse } from '@angular/common/http';
import { InjectionToken } from '@angular/core';
import { type Observable, timer } from 'rxjs';

/** How a watch waits between two asks (its first emission ends the wait); a token so specs can step time by hand. */
export type PollWait = (ms: number) => Observable<unknown>;
export const POLL_WAIT = new InjectionToken<PollWait>('POLL_WAIT', { providedIn: 'root', factory: () => (ms: number) => timer(ms) });

/** When the API sends no Retry-After: what it sends today for a running batch (api/routes/batches.ts POLL_AFTER_S). */
export const DEFAULT_POLL_MS = 2000;
// Never faster than this whatever a header says, and never so slow that the page looks stuck.
const MIN_POLL_MS = 500;
const MAX_POLL_MS = 30_000;

/** Milliseconds a Retry-After header asks for (delta-seconds or an HTTP date), or null. */
export function retryAfterMs(header: string | null, now: number = Date.now()): number | null {
  if (header === null || header.trim() === '') return null;
  const seconds = Number(header);
  if (Number.isFinite(seconds)) return seconds * 1000;
  const at = Date.parse(header);
  return Number.isNaN(at) ? null : at - now;
}

/** The wait before the next ask: the header's, kept within bounds. */
export function pollDelayMs(header: string | null): number {
  const asked = retryAfterMs(header) ?? DEFAULT_POLL_MS;
  return Math.min(MAX_POLL_MS, Math.max(MIN_POLL_MS, asked));
}

/** An ask that failed for a passing reason (network, rate limit, gateway): worth asking again after a wait. */
export function isTransient(error: unknown): error is HttpErrorResponse {
  return error instanceof HttpErrorResponse && [0, 429, 502, 503, 504].includes(error.status);
}
