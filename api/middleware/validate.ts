import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { problems, type FieldError } from '../problem.js';

export function zodFieldErrors(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({
    path: issue.path.map(String).join('.') || '(body)',
    message: issue.message,
  }));
}

/**
 * Parses the JSON body and keeps the parsed value in `res.locals.body`, so transforms and
 * defaults survive (Express 5's `req.query` is a getter and cannot be reassigned).
 */
export function validateBody<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const parsed = schema.safeParse(req.body ?? {});
    if (!parsed.success) return next(problems.validation(zodFieldErrors(parsed.error)));
    res.locals.body = parsed.data;
    next();
  };
}

export function validateQuery<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const parsed = schema.safeParse(req.query);
    if (!parsed.success) return next(problems.validation(zodFieldErrors(parsed.error), 'The query string is not valid.'));
    res.locals.query = parsed.data;
    next();
  };
}
