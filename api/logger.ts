import { pino, type Logger } from 'pino';

/** Paths that may carry secrets; they are never written to the log. */
export const REDACTED_PATHS = [
  'req.headers.authorization',
  'req.headers.cookie',
  'req.headers["x-api-key"]',
  'res.headers["set-cookie"]',
  '*.password',
  '*.token',
  '*.secret',
];

export function createLogger(level: string): Logger {
  return pino({ level, redact: { paths: REDACTED_PATHS, censor: '[redacted]' } });
}

/**
 * The server's logger: lines go to stdout without blocking the request that logs them (pino's
 * asynchronous destination writes behind the event loop and coalesces lines while a write is under
 * way; a synchronous write per request line was a large share of a small call's cost). `flush()`
 * writes what is pending; call it before exiting.
 */
export function createServerLogger(level: string): { logger: Logger; flush: () => void } {
  const destination = pino.destination({ dest: 1, sync: false });
  const logger = pino({ level, redact: { paths: REDACTED_PATHS, censor: '[redacted]' } }, destination);
  return {
    logger,
    flush: () => {
      try {
        destination.flushSync();
      } catch {
        // Not yet open, or stdout gone: nothing more can be written anyway.
      }
    },
  };
}
