import type { RequestHandler } from 'express';
import type { z } from 'zod';
import { hasControlCharacter } from '../../shared/schemas/text.js';
import { problems, type FieldError } from '../problem.js';

/** Most field errors one answer lists: enough to fix a request, never a large answer. */
const MAX_FIELD_ERRORS = 20;

export const UNKNOWN_FIELD_MESSAGE = 'unknown field';

/** `cable.maxDropPercent`, `items.1.sku`; an empty key shows as `""` so no path is blank. */
function fieldPath(segments: readonly PropertyKey[]): string {
  return segments.map((s) => (s === '' ? '""' : String(s))).join('.') || '(body)';
}

/**
 * One `{ path, message }` per issue. A refused unknown key (zod's `unrecognized_keys`, from
 * `z.strictObject`) becomes one error per key whose path names the key itself
 * (`cable.maxDropPercnt`), so a typo is found without reading the message.
 */
export function zodFieldErrors(error: z.ZodError): FieldError[] {
  const errors: FieldError[] = [];
  for (const issue of error.issues) {
    if (issue.code === 'unrecognized_keys') {
      for (const key of issue.keys) errors.push({ path: fieldPath([...issue.path, key]), message: UNKNOWN_FIELD_MESSAGE });
    } else {
      errors.push({ path: fieldPath(issue.path), message: issue.message });
    }
  }
  return errors.slice(0, MAX_FIELD_ERRORS);
}

/**
 * Keys of the input that the parsed value no longer has: the fields a schema without
 * strictness would drop silently. Request schemas are strict (`z.strictObject`), so this is the
 * safety net for a schema that forgets it. Keys the schema adds (defaults) are fine; a value the
 * schema transformed into something else than an object or array is not compared further.
 */
export function droppedKeyPaths(input: unknown, output: unknown, path: string[] = [], found: string[] = []): string[] {
  if (found.length >= MAX_FIELD_ERRORS) return found;
  if (Array.isArray(input) && Array.isArray(output)) {
    if (input.length === output.length) input.forEach((v, i) => droppedKeyPaths(v, output[i], [...path, String(i)], found));
  } else if (isPlainObject(input) && isPlainObject(output)) {
    for (const [k, v] of Object.entries(input)) {
      if (found.length >= MAX_FIELD_ERRORS) break;
      if (!Object.hasOwn(output, k)) found.push(fieldPath([...path, k]));
      else droppedKeyPaths(v, output[k], [...path, k], found);
    }
  }
  return found;
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

function unknownFieldErrors(input: unknown, output: unknown): FieldError[] {
  return droppedKeyPaths(input, output).map((path) => ({ path, message: UNKNOWN_FIELD_MESSAGE }));
}

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
    const input: unknown = req.body ?? {};
    const parsed = schema.safeParse(input);
    if (!parsed.success) return next(problems.validation(zodFieldErrors(parsed.error)));
    const unknown = unknownFieldErrors(input, parsed.data);
    if (unknown.length) return next(problems.validation(unknown));
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
    const unknown = unknownFieldErrors(req.query, parsed.data);
    if (unknown.length) return next(problems.validation(unknown, 'The query string is not valid.'));
    res.locals.query = parsed.data;
    next();
  };
}
