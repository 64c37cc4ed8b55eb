import type { Problem } from './api-types.js';

/** What went wrong, in words a shopper can act on; `kind` lets the page style and tests tell them apart. */
export interface ShopperProblem {
  kind: 'setup' | 'origin' | 'key' | 'rate-limit' | 'unreachable' | 'input' | 'service';
  message: string;
  /** Seconds until a retry may succeed (rate limits). */
  retryAfterS?: number;
  /** Field errors of a refused stair, by the request path (`staircase.treads`). */
  fields?: { path: string; message: string }[];
}

/** Retry-After as seconds: delta-seconds or an HTTP date (RFC 9110 §10.2.3). */
export function retryAfterSeconds(header: string | null, now: Date = new Date()): number | undefined {
  if (!header) return undefined;
  if (/^\d+$/.test(header.trim())) return Number(header.trim());
  const at = Date.parse(header);
  return Number.isNaN(at) ? undefined : Math.max(0, Math.ceil((at - now.getTime()) / 1000));
}

/** A refused answer of the API (problem+json) turned into what the shopper reads. */
export function problemFromAnswer(status: number, body: Partial<Problem> | null, retryAfter: string | null): ShopperProblem {
  const code = body?.code;
  if (status === 403 && (code === 'origin_not_allowed' || code === 'origin_required')) return originRefused();
  if (status === 401 || status === 403) {
    return { kind: 'key', message: 'This estimator is not set up correctly on this shop (its key was refused). Please let the shop know.' };
  }
  if (status === 429) {
    const seconds = retryAfterSeconds(retryAfter);
    const when = seconds === undefined ? 'in a moment' : seconds <= 1 ? 'in a second' : `in ${seconds} seconds`;
    return { kind: 'rate-limit', message: `Lots of estimates are being asked for right now. Please try again ${when}.`, retryAfterS: seconds };
  }
  if (status === 400 && body?.errors?.length) {
    return { kind: 'input', message: 'Some of the stair measurements are outside what we can size.', fields: body.errors.map((e) => ({ path: e.path, message: e.message })) };
  }
  if (status === 400 || status === 422) return { kind: 'input', message: body?.detail ?? 'The stair could not be sized as entered.' };
  return { kind: 'service', message: 'The estimator could not work out a kit just now. Please try again shortly.' };
}

export function originRefused(): ShopperProblem {
  return { kind: 'origin', message: 'This estimator is not enabled for this website, so it cannot show prices here. Please let the shop know.' };
}

export function unreachable(): ShopperProblem {
  return { kind: 'unreachable', message: 'The estimator service cannot be reached. Check your connection and try again.' };
}

export function setupMissing(what: string): ShopperProblem {
  return { kind: 'setup', message: `This estimator is missing its ${what}, so it cannot show prices. Please let the shop know.` };
}
