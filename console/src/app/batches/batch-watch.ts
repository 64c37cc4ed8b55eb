import { HttpErrorResponse, type HttpResponse } from '@angular/common/http';
import { InjectionToken } from '@angular/core';
import { EMPTY, type Observable, expand, map, retry, switchMap, take, throwError, timer } from 'rxjs';

import type { Batch } from '../core/api-types.js';
import { isFinal } from './batch-status.js';

/** How a watch waits between two asks (its first emission ends the wait); a token so specs can step time by hand. */
export type PollWait = (ms: number) => Observable<unknown>;
export const POLL_WAIT = new InjectionToken<PollWait>('POLL_WAIT', { providedIn: 'root', factory: () => (ms: number) => timer(ms) });

/** When the API sends no Retry-After: what it sends today (api/routes/batches.ts POLL_AFTER_S). */
export const DEFAULT_POLL_MS = 2000;
// Never faster than this whatever a header says, and never so slow that the page looks stuck.
const MIN_POLL_MS = 500;
const MAX_POLL_MS = 30_000;
// Asks that fail for a passing reason (rate limit, gateway, network) are tried again this often.
const TRANSIENT_TRIES = 5;

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

function transient(error: unknown): error is HttpErrorResponse {
  return error instanceof HttpErrorResponse && [0, 429, 502, 503, 504].includes(error.status);
}

/**
 * A job's state as it changes: asks at once, then again after each answer's Retry-After, and
 * completes with the first final status. Unsubscribing stops the timer and any ask in flight.
 */
export function watchBatch(ask: () => Observable<HttpResponse<Batch>>, wait: PollWait): Observable<Batch> {
  const askPatiently = () =>
    ask().pipe(
      retry({
        count: TRANSIENT_TRIES,
        delay: (error: unknown) => (transient(error) ? wait(pollDelayMs(error.headers.get('Retry-After'))) : throwError(() => error)),
      }),
    );
  return askPatiently().pipe(
    expand((response) => (isFinal(bodyOf(response).status) ? EMPTY : wait(pollDelayMs(response.headers.get('Retry-After'))).pipe(take(1), switchMap(askPatiently)))),
    map(bodyOf),
  );
}

function bodyOf(response: HttpResponse<Batch>): Batch {
  if (!response.body) throw new Error('The API answered a batch job without a body.');
  return response.body;
}
