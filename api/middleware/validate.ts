import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { checkInput, findingsOf, unknownFieldErrors, zodFieldErrors } from '../../shared/schemas/check-input.js';
import { problems } from '../problem.js';

export { checkInput, zodFieldErrors, UNKNOWN_FIELD_MESSAGE } from '../../shared/schemas/check-input.js';

/**
 * Parses the JSON body and keeps the parsed value in `res.locals.body`, so transforms and
 * defaults survive (Express 5's `req.query` is a getter and cannot be reassigned).
 *
 * Unknown fields are refused (400 naming each), never dropped: a typo such as `maxDropPercnt`
 * must not run silently with the default. The one planned exception is the payment provider's
 * webhook, which takes the provider's payloads as they come and so will not use this middleware.
 */
export function validateBody<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const checked = checkInput(schema, req.body ?? {});
    if (!checked.ok) return next(problems.validation(checked.errors));
    res.locals.body = checked.data;
    next();
  };
}

export function validateQuery<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const parsed = schema.safeParse(req.query);
    if (!parsed.success) return next(problems.validation(zodFieldErrors(parsed.error), 'The query string is not valid.'));
    const { unknown } = findingsOf(req.query, parsed.data);
    if (unknown.length) return next(problems.validation(unknownFieldErrors(unknown), 'The query string is not valid.'));
    res.locals.query = parsed.data;
    next();
  };
}
