import type { Request, RequestHandler } from 'express';
import { HttpProblem } from '../problem.js';

/** What express.json() can inflate; anything else is refused before a byte is parsed. */
const ENCODINGS = new Set(['identity', 'gzip', 'deflate', 'br']);

/** The routes that take a multipart file upload instead of JSON. */
const UPLOAD_ROUTES = new Set(['POST /v1/catalog/imports', 'POST /v1/batches']);

/** A body is present when one is framed: chunked, or a non-zero Content-Length. */
function hasBody(req: Request): boolean {
  return req.headers['transfer-encoding'] !== undefined || Number(req.headers['content-length'] ?? 0) > 0;
}

/**
 * Every API route reads JSON. A body of another type would reach the schema as "nothing" and
 * come back as a list of missing fields, which tells the caller the wrong thing: answer 415
 * instead, naming what to send. Same for a Content-Encoding the parser cannot undo.
 */
export const jsonBodyOnly: RequestHandler = (req, _res, next) => {
  if (!hasBody(req)) return next();
  // File uploads: multer reads (and bounds) these multipart bodies in their routes.
  if (UPLOAD_ROUTES.has(`${req.method} ${req.baseUrl}${req.path}`) && req.is('multipart/form-data')) return next();
  if (!req.is('application/json')) {
    const sent = req.headers['content-type'] ?? 'none';
    return next(
      new HttpProblem(415, 'unsupported_media_type', 'Unsupported media type', `The body must be JSON sent as Content-Type: application/json (got ${sent.slice(0, 100)}).`),
    );
  }
  const encoding = (req.headers['content-encoding'] ?? 'identity').trim().toLowerCase();
  if (!ENCODINGS.has(encoding)) {
    return next(
      new HttpProblem(415, 'unsupported_encoding', 'Unsupported encoding', `Content-Encoding ${encoding.slice(0, 40)} is not supported; send identity, gzip, deflate or br.`),
    );
  }
  next();
};
