import type { HttpResponse } from '@angular/common/http';
import { EMPTY, type Observable, defer, expand, map, retry, switchMap, take, throwError } from 'rxjs';

import { type PollWait, isTransient, pollDelayMs } from '../core/poll.js';
import type { BillingOverview } from '../core/api-types.js';

/** About half a minute at the API's usual pace: the provider's webhook normally lands within a second or two. */
export const MAX_ASKS = 15;
// An ask that fails for a passing reason (rate limit, gateway, network) is tried again this often.
const TRANSIENT_TRIES = 3;


/**
 * The overview while a payment is being applied: asks at once, then again after each answer's
 * Retry-After (or the usual pause), and completes with the first overview for which `applied`
 * holds, or after `maxAsks` asks. Unsubscribing stops the timer and any ask in flight.
 */
export function watchPlan(
  ask: () => Observable<HttpResponse<BillingOverview>>,
  wait: PollWait,
  applied: (overview: BillingOverview) => boolean,
  maxAsks = MAX_ASKS,
): Observable<BillingOverview> {
  let asks = 0;
  const askPatiently = () =>
    defer(() => {
      asks += 1;
      return ask().pipe(
        retry({
          count: TRANSIENT_TRIES,
          delay: (error: unknown) => (isTransient(error) ? wait(pollDelayMs(error.headers.get('Retry-After'))) : throwError(() => error)),
        }),
      );
    });
  return askPatiently().pipe(
    expand((response) =>
      applied(bodyOf(response)) || asks >= maxAsks ? EMPTY : wait(pollDelayMs(response.headers.get('Retry-After'))).pipe(take(1), switchMap(askPatiently)),
    ),
    map(bodyOf),
  );
}

function bodyOf(response: HttpResponse<BillingOverview>): BillingOverview {
  if (!response.body) throw new Error('The API answered the billing overview without a body.');
  return response.body;
}
