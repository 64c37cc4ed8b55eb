import { HttpErrorResponse, HttpHeaders, HttpResponse } from '@angular/common/http';
import { Subject, defer, of, throwError } from 'rxjs';
import { describe, expect, it } from 'vitest';

import type { Batch } from '../core/api-types.js';
import { alderRowJob, alderRowJobDone } from './batch-fixtures.js';
import { DEFAULT_POLL_MS, pollDelayMs, retryAfterMs } from '../core/poll.js';
import { watchBatch } from './batch-watch.js';

type Answer = { batch: Batch; retryAfter?: string } | { error: HttpErrorResponse };

/** A fake API answering from a script, and a clock that moves only when the test ticks it. */
function harness(script: Answer[]) {
  const asked: number[] = [];
  const waits: number[] = [];
  const clock = new Subject<void>();
  const ask = () =>
    defer(() => {
      asked.push(asked.length);
      const next = script.shift();
      if (!next) throw new Error('asked more often than the script answers');
      if ('error' in next) return throwError(() => next.error);
      const headers = next.retryAfter === undefined ? new HttpHeaders() : new HttpHeaders({ 'Retry-After': next.retryAfter });
      return of(new HttpResponse({ body: next.batch, headers }));
    });
  const wait = (ms: number) => {
    waits.push(ms);
    return clock.pipe();
  };
  const seen: Batch['status'][] = [];
  let done = false;
  const subscription = watchBatch(ask, wait).subscribe({ next: (b) => seen.push(b.status), complete: () => (done = true) });
  return { asked, waits, seen, tick: () => clock.next(), isDone: () => done, subscription, clock };
}

describe('watchBatch', () => {
  it('asks again after each Retry-After and stops at the first final status', () => {
    const h = harness([{ batch: alderRowJob({ status: 'queued' }), retryAfter: '2' }, { batch: alderRowJob(), retryAfter: '5' }, { batch: alderRowJobDone() }]);
    expect(h.seen).toEqual(['queued']);
    expect(h.waits).toEqual([2000]);
    h.tick();
    expect(h.seen).toEqual(['queued', 'running']);
    expect(h.waits).toEqual([2000, 5000]); // the header's wait, not a fixed one
    h.tick();
    expect(h.seen).toEqual(['queued', 'running', 'succeeded']);
    expect(h.isDone()).toBe(true);
    h.tick(); // time goes on; nobody asks any more
    expect(h.asked).toHaveLength(3);
    expect(h.clock.observed).toBe(false);
  });

  it('stops the timer when the watcher leaves before the job ends', () => {
    const h = harness([{ batch: alderRowJob(), retryAfter: '2' }]);
    expect(h.clock.observed).toBe(true);
    h.subscription.unsubscribe();
    expect(h.clock.observed).toBe(false);
    h.tick();
    expect(h.asked).toHaveLength(1);
  });

  it('waits out a 429 as its Retry-After says and goes on', () => {
    const limited = new HttpErrorResponse({ status: 429, headers: new HttpHeaders({ 'Retry-After': '7' }) });
    const h = harness([{ batch: alderRowJob(), retryAfter: '2' }, { error: limited }, { batch: alderRowJobDone() }]);
    h.tick();
    expect(h.waits).toEqual([2000, 7000]);
    h.tick();
    expect(h.seen).toEqual(['running', 'succeeded']);
  });

  it('gives up at once on a job that is not there', () => {
    const gone = new HttpErrorResponse({ status: 404 });
    const errors: unknown[] = [];
    watchBatch(() => throwError(() => gone), () => of(0)).subscribe({ error: (e: unknown) => errors.push(e) });
    expect(errors).toEqual([gone]);
  });
});

describe('poll delays', () => {
  it('reads seconds and HTTP dates, and keeps the wait within bounds', () => {
    expect(retryAfterMs('3')).toBe(3000);
    expect(retryAfterMs('Wed, 02 Dec 2026 12:00:10 GMT', Date.parse('2026-12-02T12:00:00Z'))).toBe(10_000);
    expect(retryAfterMs('soon')).toBeNull();
    expect(pollDelayMs(null)).toBe(DEFAULT_POLL_MS);
    expect(pollDelayMs('0')).toBe(500);
    expect(pollDelayMs('3600')).toBe(30_000);
  });
});
