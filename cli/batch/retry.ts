import { CliError } from '../errors.js';

/**
 * Retries for the batch job calls: a 429 waits what its Retry-After says; a 5xx or a network
 * failure waits an exponentially growing, jittered delay. Attempts are bounded, and every wait
 * ends early when the run is interrupted (Ctrl-C).
 */
export interface RetryPolicy {
  /** Tries of one call, the first included. */
  attempts: number;
  baseDelayMs: number;
  maxDelayMs: number;
  /** Longest Retry-After honoured; a longer one is waited this long, then tried again. */
  maxRetryAfterMs: number;
}

export const DEFAULT_RETRY: RetryPolicy = { attempts: 6, baseDelayMs: 500, maxDelayMs: 15_000, maxRetryAfterMs: 120_000 };

export class Interrupted extends Error {
  constructor() {
    super('interrupted');
  }
}

/** Waits `ms`, or less when `signal` aborts (then throws Interrupted). */
export function sleep(ms: number, signal?: AbortSignal): Promise<void> {
  return new Promise((resolve, reject) => {
    if (signal?.aborted) return reject(new Interrupted());
    const timer = setTimeout(() => {
      signal?.removeEventListener('abort', onAbort);
      resolve();
    }, ms);
    const onAbort = () => {
      clearTimeout(timer);
      reject(new Interrupted());
    };
    signal?.addEventListener('abort', onAbort, { once: true });
  });
}

/** Retry-After as milliseconds: delta-seconds or an HTTP date; null when absent or unreadable. */
export function retryAfterMs(header: string | null, now = Date.now()): number | null {
  if (!header) return null;
  const trimmed = header.trim();
  if (/^\d+$/.test(trimmed)) return Number(trimmed) * 1000;
  const date = Date.parse(trimmed);
  return Number.isNaN(date) ? null : Math.max(0, date - now);
}

/** Full exponential delay for the n-th retry (0-based), with half of it random ("equal jitter"). */
export function backoffMs(retry: number, policy: RetryPolicy, random = Math.random): number {
  const ceiling = Math.min(policy.maxDelayMs, policy.baseDelayMs * 2 ** retry);
  return Math.round(ceiling / 2 + random() * (ceiling / 2));
}

const RETRIED_STATUS = new Set([429, 500, 502, 503, 504]);

export interface RetryNotice {
  attempt: number;
  waitMs: number;
  reason: string;
}

/**
 * Calls `send` until it answers something other than 429/5xx, or the attempts run out (then the
 * last answer is returned, or the last network error thrown). `send` builds a new request each time.
 */
export async function withRetries(
  send: () => Promise<Response>,
  opts: { policy?: RetryPolicy; signal?: AbortSignal; onRetry?: (notice: RetryNotice) => void },
): Promise<Response> {
  const policy = opts.policy ?? DEFAULT_RETRY;
  for (let attempt = 1; ; attempt++) {
    let response: Response | undefined;
    let failure: unknown;
    try {
      response = await send();
    } catch (err) {
      if (opts.signal?.aborted) throw new Interrupted();
      // A failure the user must fix (not the network) is not retried.
      if (err instanceof CliError && !/^cannot reach /.test(err.message)) throw err;
      failure = err;
    }
    if (response && !RETRIED_STATUS.has(response.status)) return response;
    if (attempt >= policy.attempts) {
      if (response) return response;
      throw failure;
    }
    const after = response ? retryAfterMs(response.headers.get('retry-after')) : null;
    const waitMs = after !== null ? Math.min(after, policy.maxRetryAfterMs) : backoffMs(attempt - 1, policy);
    const reason = response ? `HTTP ${response.status}` : ((failure as Error).message ?? 'network error');
    // The answer's body is not needed: release the connection before waiting.
    await response?.body?.cancel().catch(() => {});
    opts.onRetry?.({ attempt, waitMs, reason });
    await sleep(waitMs, opts.signal);
  }
}
