import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { hasControlCharacter } from '../../shared/schemas/text.js';
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
    // Every text field, whatever its schema: a NUL or other control character never reaches the
    // database (PostgreSQL refuses NUL in text) nor a log line.
    const controlled = controlCharacterPaths(parsed.data);
    if (controlled.length) return next(problems.validation(controlled.map((path) => ({ path, message: 'must not contain control characters' }))));
    res.locals.body = parsed.data;
    next();
  };
}

/** Paths of the strings (and object keys) in a parsed body that hold control characters. */
export function controlCharacterPaths(value: unknown, path: string[] = [], found: string[] = []): string[] {
  if (found.length >= 20) return found;
  if (typeof value === 'string') {
    if (hasControlCharacter(value)) found.push(path.join('.') || '(body)');
  } else if (Array.isArray(value)) {
    value.forEach((v, i) => controlCharacterPaths(v, [...path, String(i)], found));
  } else if (value !== null && typeof value === 'object') {
    for (const [k, v] of Object.entries(value)) {
      if (hasControlCharacter(k)) found.push([...path, k].join('.'));
      controlCharacterPaths(v, [...path, k], found);
    }
  }
  return found;
}

export function validateQuery<S extends z.ZodType>(schema: S): RequestHandler {
  return (req, res, next) => {
    const parsed = schema.safeParse(req.query);
    if (!parsed.success) return next(problems.validation(zodFieldErrors(parsed.error), 'The query string is not valid.'));
    res.locals.query = parsed.data;
    next();
  };
}
