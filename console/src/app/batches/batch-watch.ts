import type { HttpResponse } from '@angular/common/http';
import { EMPTY, type Observable, expand, map, retry, switchMap, take, throwError } from 'rxjs';

import type { Batch } from '../core/api-types.js';
import { type PollWait, isTransient, pollDelayMs } from '../core/poll.js';
import { isFinal } from './batch-status.js';

// Asks that fail for a passing reason (rate limit, gateway, network) are tried again this often.
const TRANSIENT_TRIES = 5;

/**
 * A job's state as it changes: asks at once, then again after each answer's Retry-After, and
 * completes with the first final status. Unsubscribing stops the timer and any ask in flight.
 */
export function watchBatch(ask: () => Observable<HttpResponse<Batch>>, wait: PollWait): Observable<Batch> {
  const askPatiently = () =>
    ask().pipe(
      retry({
        count: TRANSIENT_TRIES,
        delay: (error: unknown) => (isTransient(error) ? wait(pollDelayMs(error.headers.get('Retry-After'))) : throwError(() => error)),
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
