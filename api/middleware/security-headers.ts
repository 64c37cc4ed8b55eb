import type { RequestHandler } from 'express';
import helmet, { type HelmetOptions } from 'helmet';

/**
 * Helmet's headers, worked out once: helmet runs at start-up against a recording response, and
 * each request then gets the same header list (and the same removals) in one loop instead of
 * helmet's fourteen chained middleware. None of helmet's headers depends on the request, and
 * helmet stays the source of every value.
 */
export function securityHeaders(options: Readonly<HelmetOptions>): RequestHandler {
  const set: [string, string][] = [];
  const removed: string[] = [];
  const recorder = {
    setHeader: (name: string, value: unknown) => void set.push([name, String(value)]),
    removeHeader: (name: string) => void removed.push(name),
  };
  let done = false;
  helmet(options)({} as never, recorder as never, (err?: unknown) => {
    if (err) throw err;
    done = true;
  });
  if (!done || set.length === 0) throw new Error('helmet did not finish synchronously: its headers cannot be precomputed');
  return (_req, res, next) => {
    for (let i = 0; i < set.length; i++) res.setHeader(set[i][0], set[i][1]);
    for (let i = 0; i < removed.length; i++) res.removeHeader(removed[i]);
    next();
  };
}
