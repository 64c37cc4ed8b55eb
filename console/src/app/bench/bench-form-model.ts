import type { z } from 'zod';

/** One input of a bench form. `name` is the request field's path, dotted (`conductor.awg`). */
export interface BenchField {
  name: string;
  label: string;
  kind: 'number' | 'numbers' | 'select' | 'toggle';
  unit?: string;
  hint?: string;
  /** Pre-filled so the form answers at once; the API's default applies when left empty. */
  initial?: string;
  options?: ReadonlyArray<{ value: string; label: string }>;
  /** For selects whose values are numbers on the wire (bitsPerPixel). */
  numericOptions?: true;
}

/** Value shown in the answer. */
export interface BenchFigure {
  label: string;
  value: string;
}

/** A calculation endpoint as a small form: the request schema the API validates with, its fields, how to read its answer. */
export interface BenchCalculator {
  id: string;
  title: string;
  summary: string;
  path: string;
  schema: z.ZodType;
  fields: readonly BenchField[];
  figures(result: never): BenchFigure[];
}

export type FieldValues = Record<string, string | boolean>;

/** Field name → the message shown beside it; `''` holds problems that belong to no one field. */
export type FieldErrors = Record<string, string>;

function setPath(target: Record<string, unknown>, path: string, value: unknown): void {
  const keys = path.split('.');
  let node = target;
  for (const key of keys.slice(0, -1)) node = (node[key] ??= {}) as Record<string, unknown>;
  node[keys.at(-1)!] = value;
}

/** The request body from the form, leaving empty fields out (the API's defaults apply), and what could not be read as a number. */
export function requestBody(fields: readonly BenchField[], values: FieldValues): { body: Record<string, unknown>; errors: FieldErrors } {
  const body: Record<string, unknown> = {};
  const errors: FieldErrors = {};
  for (const field of fields) {
    const raw = values[field.name];
    if (field.kind === 'toggle') {
      if (raw === true) setPath(body, field.name, true);
      continue;
    }
    const text = typeof raw === 'string' ? raw.trim() : '';
    if (text === '') continue;
    if (field.kind === 'select') {
      setPath(body, field.name, field.numericOptions ? Number(text) : text);
    } else if (field.kind === 'numbers') {
      const numbers = text.split(/[\s,;]+/).filter(Boolean).map(Number);
      if (numbers.some((n) => !Number.isFinite(n))) errors[field.name] = 'Numbers only, separated by commas or spaces.';
      else setPath(body, field.name, numbers);
    } else {
      const number = Number(text.replace(',', '.'));
      if (!Number.isFinite(number)) errors[field.name] = 'A number, please.';
      else setPath(body, field.name, number);
    }
  }
  return { body, errors };
}

interface Issue {
  code: string;
  path: ReadonlyArray<PropertyKey>;
  message: string;
  minimum?: number | bigint;
  maximum?: number | bigint;
  inclusive?: boolean;
  origin?: string;
}

/** A zod issue in the words a form shows beside its field. */
export function issueMessage(issue: Issue): string {
  const items = issue.origin === 'array';
  if (issue.code === 'too_small' && issue.minimum !== undefined) {
    if (items) return `At least ${issue.minimum} ${issue.minimum === 1 ? 'value' : 'values'}.`;
    return issue.inclusive === false ? `More than ${issue.minimum}.` : `At least ${issue.minimum}.`;
  }
  if (issue.code === 'too_big' && issue.maximum !== undefined) {
    if (items) return `At most ${issue.maximum} values.`;
    return issue.inclusive === false ? `Less than ${issue.maximum}.` : `At most ${issue.maximum}.`;
  }
  if (issue.code === 'invalid_type' && issue.message.includes('received undefined')) return 'Needed.';
  if (issue.code === 'invalid_type' && issue.message.includes('expected int')) return 'A whole number.';
  return issue.message;
}

/**
 * Which field a path belongs to: the longest field name it starts with (`piecesMm.3` → `piecesMm`),
 * else the first field under it (`conductor` → `conductor.crossSectionMm2`), else none (`''`).
 */
export function fieldFor(fields: readonly BenchField[], path: string): string {
  const names = fields.map((f) => f.name).sort((a, b) => b.length - a.length);
  const owner = names.find((n) => path === n || path.startsWith(`${n}.`));
  if (owner) return owner;
  return fields.find((f) => path !== '' && f.name.startsWith(`${path}.`))?.name ?? '';
}

/** Checks the body with the API's own request schema; errors keyed by field, the first per field. */
export function validate(calculator: Pick<BenchCalculator, 'schema' | 'fields'>, body: unknown): FieldErrors {
  const parsed = calculator.schema.safeParse(body);
  if (parsed.success) return {};
  const errors: FieldErrors = {};
  for (const issue of parsed.error.issues) {
    const path = issue.path.map(String).join('.');
    const field = fieldFor(calculator.fields, path);
    const message = issue.code === 'invalid_union' ? 'Give one of these, not both or neither.' : issueMessage(issue as unknown as Issue);
    if (!(field in errors)) errors[field] = message;
  }
  return errors;
}

/** The API's 400 `errors[{ path, message }]`, placed beside the fields they name. */
export function problemFieldErrors(fields: readonly BenchField[], errors: ReadonlyArray<{ path: string; message: string }>): FieldErrors {
  const placed: FieldErrors = {};
  for (const { path, message } of errors) {
    const field = fieldFor(fields, path);
    if (!(field in placed)) placed[field] = message;
  }
  return placed;
}

/** The form's starting values. */
export function initialValues(fields: readonly BenchField[]): FieldValues {
  return Object.fromEntries(fields.map((f) => [f.name, f.kind === 'toggle' ? false : (f.initial ?? '')]));
}
