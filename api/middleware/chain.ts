import type { NextFunction, Request, RequestHandler, Response } from 'express';

/**
 * Runs `handlers` in order as if each were mounted on its own, stopping at the first error; a
 * rejected promise goes to `next` as Express 5 sends it. One router layer instead of one per
 * handler: on the hot path each layer walked (path match, prefix trim, restore) cost more than
 * most of the handlers themselves.
 */
export function runInOrder(handlers: readonly RequestHandler[], req: Request, res: Response, next: NextFunction): void {
  let i = 0;
  const step = (err?: unknown): void => {
    if (err !== undefined || i === handlers.length) return next(err);
    const handler = handlers[i++];
    try {
      const result = handler(req, res, step) as unknown;
      if (result instanceof Promise) result.catch((e: unknown) => next(e ?? new Error('Rejected promise')));
    } catch (e) {
      next(e);
    }
  };
  step();
}

/** The handlers as one middleware (see runInOrder). */
export function chain(...handlers: RequestHandler[]): RequestHandler {
  return (req, res, next) => runInOrder(handlers, req, res, next);
}

/** Whether Express would match `path` under a mount point `prefix` (case-insensitive, at a segment boundary). */
export function isUnder(path: string, prefix: string): boolean {
  if (path.length < prefix.length) return false;
  const head = path.slice(0, prefix.length).toLowerCase();
  return head === prefix && (path.length === prefix.length || path[prefix.length] === '/');
}
