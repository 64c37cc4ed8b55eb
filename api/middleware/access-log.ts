import type { Request, RequestHandler } from 'express';
import type { Logger } from 'pino';
import { whenAnswered } from './answered.js';
import { requestId } from './request-id.js';

declare module 'node:http' {
  interface IncomingMessage {
    /** The request id (echoed in X-Request-Id, in problems and in every log line of the request). */
    id: string;
    /** A logger whose lines carry this request (`req`: id, method, path, client address). */
    log: Logger;
  }
}

/** Method, path and client are enough to follow a request; headers may carry credentials. */
function requestFields(req: Request) {
  // The query string is dropped: e-mailed links carry single-use tokens there.
  const url = req.originalUrl;
  const q = url.indexOf('?');
  return { id: req.id, method: req.method, url: q === -1 ? url : url.slice(0, q), remoteAddress: req.socket.remoteAddress };
}

const levelOf = (status: number) => (status >= 500 ? 'error' : status >= 400 ? 'warn' : 'info');

/**
 * The access log: one line per request once it is answered (or the client went away), at info,
 * warn for 4xx, error for 5xx (`request completed`, `request aborted` when the client went
 * away first, `request errored`), with `req`, `res.statusCode` and `responseTime` (ms), the same
 * line pino-http wrote. Also sets `req.id` (see request-id.ts) and `req.log`, a child logger
 * made only when a handler logs (most requests never do; making one per request cost more than
 * writing the line).
 */
export function accessLog(logger: Logger): RequestHandler {
  return (req, res, next) => {
    req.id = requestId(req, res);
    const started = Date.now();
    let child: Logger | undefined;
    Object.defineProperty(req, 'log', {
      configurable: true,
      enumerable: false,
      get: () => (child ??= logger.child({ req: requestFields(req) })),
    });
    whenAnswered(res, () => {
      const status = res.statusCode;
      const fields = { req: requestFields(req), res: { statusCode: status }, responseTime: Date.now() - started };
      const level = levelOf(status);
      if (status >= 500) logger[level]({ ...fields, err: new Error(`failed with status code ${status}`) }, 'request errored');
      else logger[level](fields, !req.readableAborted && res.writableEnded ? 'request completed' : 'request aborted');
    });
    next();
  };
}
