import type { ErrorRequestHandler, RequestHandler } from 'express';
import { SizingInputError } from '../../shared/tables/errors.js';
import { HttpProblem, problems, problemType } from '../problem.js';

interface BodyParserError {
  type?: string;
  status?: number;
  expose?: boolean;
}

/** Drizzle puts the query's parameters (which may be tokens or secrets) in its messages. */
function loggable(err: unknown): unknown {
  if (err && typeof err === 'object' && 'query' in err && 'params' in err) {
    const e = err as { query: string; cause?: { message?: string; code?: string } };
    return { type: 'DatabaseError', query: e.query, cause: e.cause?.message, code: e.cause?.code };
  }
  return err;
}

/** Maps errors from Express's own body parser to problems a client can act on. */
function fromBodyParser(err: BodyParserError): HttpProblem | undefined {
  switch (err.type) {
    case 'entity.parse.failed':
      return new HttpProblem(400, 'malformed_json', 'Malformed JSON', 'The request body is not valid JSON.');
    case 'entity.too.large':
      return new HttpProblem(413, 'body_too_large', 'Request body too large', 'The request body exceeds the size limit.');
    case 'encoding.unsupported':
    case 'charset.unsupported':
      return new HttpProblem(415, 'unsupported_encoding', 'Unsupported encoding', 'Send UTF-8 JSON.');
    default:
      // Other client errors from Express itself (e.g. a malformed %-escape in a path parameter).
      if (err.expose && err.status && err.status >= 400 && err.status < 500) {
        return new HttpProblem(err.status, 'bad_request', 'Bad request', 'The request could not be understood.');
      }
      return undefined;
  }
}

/** The one place errors become RFC 9457 problem+json. Never leaks a stack trace. */
export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const problem =
    err instanceof HttpProblem
      ? err
      : err instanceof SizingInputError
        ? problems.validation([{ path: err.path.join('.'), message: err.message }], 'The engine cannot size this input.')
        : (fromBodyParser(err as BodyParserError) ??
        new HttpProblem(500, 'internal_error', 'Internal server error', 'Something went wrong on our side.'));
  if (problem.status >= 500) req.log?.error({ err: loggable(err) }, 'request failed');
  if (res.headersSent) return;
  for (const [name, value] of Object.entries(problem.extra.headers ?? {})) res.setHeader(name, value);
  res
    .status(problem.status)
    .type('application/problem+json')
    .json({
      type: problemType(problem.code),
      title: problem.title,
      status: problem.status,
      detail: problem.detail,
      instance: req.originalUrl,
      code: problem.code,
      requestId: req.id,
      ...(problem.extra.errors ? { errors: problem.extra.errors } : {}),
    });
};

export const notFoundHandler: RequestHandler = (req, _res, next) => {
  next(new HttpProblem(404, 'not_found', 'Not found', `No route for ${req.method} ${req.path}.`));
};
