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
