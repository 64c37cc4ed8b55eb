import { randomUUID } from 'node:crypto';
import type { IncomingMessage, ServerResponse } from 'node:http';

// A client's id is echoed only when it is safe to log and to put in a header.
const WELL_FORMED = /^[A-Za-z0-9][A-Za-z0-9._:-]{0,127}$/;

/** pino-http's genReqId: reuse a well-formed `X-Request-Id`, otherwise mint one; always echo it. */
export function requestId(req: IncomingMessage, res: ServerResponse): string {
  const given = req.headers['x-request-id'];
  const id = typeof given === 'string' && WELL_FORMED.test(given) ? given : randomUUID();
  res.setHeader('X-Request-Id', id);
  return id;
}
