import type { z } from 'zod';
import { hasControlCharacter } from './text.js';

/**
 * The checks every request body gets, as a pure function so that the API's validator, each item of
 * a batch (synchronous, background job or `treadwise batch --local`) and the CLI answer the same
 * field errors for the same input.
 */

/** One field's error: its dotted path and what is wrong with it. */
export interface FieldError {
  path: string;
  message: string;
}

/** Most field errors one answer lists: enough to fix a request, never a large answer. */
export const MAX_FIELD_ERRORS = 20;

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

/** What one walk over a request finds: unknown fields and text with control characters. */
interface Findings {
  unknown: string[];
  controlled: string[];
}

/**
 * One walk over the input and the parsed value side by side (the hot path reads each body once):
 * - keys of the input that the parsed value no longer has — the fields a schema without
 *   strictness would drop silently (request schemas are strict, `z.strictObject`, so this is the
 *   safety net for one that forgets it). Keys the schema adds (defaults) are fine; a value the
 *   schema turned into something other than an object or array is not compared further;
 * - strings (and keys) of the parsed value holding control characters, whatever the schema.
 */
function inspect(input: unknown, output: unknown, path: PropertyKey[], found: Findings): void {
  if (found.unknown.length >= MAX_FIELD_ERRORS || found.controlled.length >= MAX_FIELD_ERRORS) return;
  if (typeof output === 'string') {
    if (hasControlCharacter(output)) found.controlled.push(fieldPath(path));
  } else if (Array.isArray(output)) {
    const pairs = Array.isArray(input) && input.length === output.length;
    output.forEach((v, i) => {
      path.push(i);
      inspect(pairs ? (input as unknown[])[i] : undefined, v, path, found);
      path.pop();
    });
  } else if (isPlainObject(output)) {
    if (isPlainObject(input)) {
      for (const k of Object.keys(input)) if (!Object.hasOwn(output, k)) found.unknown.push(fieldPath([...path, k]));
    }
    for (const [k, v] of Object.entries(output)) {
      path.push(k);
      if (hasControlCharacter(k)) found.controlled.push(fieldPath(path));
      inspect(isPlainObject(input) ? input[k] : undefined, v, path, found);
      path.pop();
    }
  }
}

function isPlainObject(value: unknown): value is Record<string, unknown> {
  return value !== null && typeof value === 'object' && !Array.isArray(value);
}

export function findingsOf(input: unknown, output: unknown): Findings {
  const found: Findings = { unknown: [], controlled: [] };
  inspect(input, output, [], found);
  return found;
}

export const unknownFieldErrors = (paths: string[]): FieldError[] => paths.slice(0, MAX_FIELD_ERRORS).map((path) => ({ path, message: UNKNOWN_FIELD_MESSAGE }));

/**
 * What validateBody checks, on any value: the schema, fields a schema dropped (refused, never
 * lost) and control characters in text. The parsed value, or the field errors.
 */
export function checkInput<S extends z.ZodType>(schema: S, input: unknown): { ok: true; data: z.output<S> } | { ok: false; errors: FieldError[] } {
  const parsed = schema.safeParse(input);
  if (!parsed.success) return { ok: false, errors: zodFieldErrors(parsed.error) };
  const { unknown, controlled } = findingsOf(input, parsed.data);
  if (unknown.length) return { ok: false, errors: unknownFieldErrors(unknown) };
  // Every text field, whatever its schema: a NUL or other control character never reaches the
  // database (PostgreSQL refuses NUL in text) nor a log line.
  if (controlled.length) {
    return { ok: false, errors: controlled.slice(0, MAX_FIELD_ERRORS).map((path) => ({ path, message: 'must not contain control characters' })) };
  }
  return { ok: true, data: parsed.data };
}
