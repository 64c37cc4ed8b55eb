import type { z } from 'zod';
import { estimateRequestSchema } from './estimate.js';

/**
 * The flat row of a stair, for CSV files of many stairs (batch jobs, `treadwise batch --local`):
 * one column per field of the estimate request, named by its dotted path (`staircase.treads`,
 * `treadStrip.voltageV`, `controller.profileId`), arrays as indexed columns
 * (`staircase.flights.0.treads`, `drivers.availableRatingsW.1`), and a `ref` column first for
 * the stair's own reference. Everything is read off the zod schema, never listed by hand, so a
 * field added to the request is a column at once. See docs/batch-rows.md.
 */

/** The reference column; the rest are the request's fields. */
export const REF_COLUMN = 'ref';

/** A cell as a CSV reader gives it (text), or as requestToRow writes it (typed). Empty: omitted. */
export type StairRowCell = string | number | boolean | null | undefined;
export type StairRow = Record<string, StairRowCell>;

/** A row read back: the stair's reference and its request, still to be validated by the schema. */
export interface StairRowRequest {
  ref?: string;
  request: Record<string, unknown>;
}

/**
 * Indexed columns a listing (the template, a file's header) shows for an array when no row needs
 * more: enough to show the pattern. Rows may carry more; the reader takes any index.
 */
export const DEFAULT_ARRAY_COLUMNS = 2;

// ---- reading the zod schema ---------------------------------------------------------------------

interface Def {
  type: string;
  shape?: Record<string, z.ZodType>;
  element?: z.ZodType;
  options?: z.ZodType[];
  innerType?: z.ZodType;
  in?: z.ZodType;
  out?: z.ZodType;
  getter?: () => z.ZodType;
  left?: z.ZodType;
  right?: z.ZodType;
  values?: unknown[];
  entries?: Record<string, unknown>;
}
const defOf = (schema: z.ZodType): Def => (schema as unknown as { _zod: { def: Def } })._zod.def;

/** Wrappers that do not change what a cell holds. */
const WRAPPERS = new Set(['optional', 'nullable', 'default', 'prefault', 'readonly', 'catch', 'nonoptional', 'success']);

/** The schemas a value at this point may match, wrappers and unions unfolded. */
function alternatives(schema: z.ZodType): z.ZodType[] {
  const def = defOf(schema);
  if (WRAPPERS.has(def.type) && def.innerType) return alternatives(def.innerType);
  if (def.type === 'pipe' && def.in) return alternatives(defOf(def.in).type === 'transform' && def.out ? def.out : def.in);
  if (def.type === 'lazy' && def.getter) return alternatives(def.getter());
  if (def.type === 'union' && def.options) return def.options.flatMap(alternatives);
  if (def.type === 'intersection' && def.left && def.right) return [...alternatives(def.left), ...alternatives(def.right)];
  return [schema];
}

/** Where a path segment leads from these schemas (object fields by name, array items by index). */
function step(schemas: z.ZodType[], segment: string): z.ZodType[] {
  const next: z.ZodType[] = [];
  for (const s of schemas) {
    const def = defOf(s);
    if (def.type === 'object' && def.shape && Object.hasOwn(def.shape, segment)) next.push(...alternatives(def.shape[segment]!));
    else if (def.type === 'array' && def.element && /^\d+$/.test(segment)) next.push(...alternatives(def.element));
  }
  return next;
}

type LeafKind = 'number' | 'boolean' | 'string';

/** What kinds of scalar the schemas at a path accept, in the order a cell is tried. */
function leafKinds(schemas: z.ZodType[]): Set<LeafKind> {
  const kinds = new Set<LeafKind>();
  for (const s of schemas) {
    const def = defOf(s);
    if (def.type === 'number' || def.type === 'int' || def.type === 'bigint') kinds.add('number');
    else if (def.type === 'boolean') kinds.add('boolean');
    else if (def.type === 'string' || def.type === 'enum' || def.type === 'template_literal') {
      if (def.type === 'enum' && def.entries && Object.values(def.entries).some((v) => typeof v === 'number')) kinds.add('number');
      kinds.add('string');
    } else if (def.type === 'literal' && def.values) {
      for (const v of def.values) kinds.add(typeof v === 'number' ? 'number' : typeof v === 'boolean' ? 'boolean' : 'string');
    }
  }
  return kinds;
}

/** Typed value of a text cell at a path: the first kind the schema accepts that the text spells. */
function typedCell(text: string, kinds: Set<LeafKind>): unknown {
  if (kinds.has('number') && /^\s*-?(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?\s*$/.test(text)) return Number(text);
  if (kinds.has('boolean') && /^(true|false)$/i.test(text.trim())) return text.trim().toLowerCase() === 'true';
  // Otherwise the text as written: a number field holding "abc" is refused by the schema naming the column.
  return text;
}

// ---- columns ------------------------------------------------------------------------------------

/**
 * Every column of the request, in schema order: for each layout's fields (layouts share most),
 * each nested field, and `width(path)` indexed columns for each array (its path has no index).
 */
function columnsOf(schemas: z.ZodType[], prefix: string, width: (arrayPath: string) => number, into: string[], seen: Set<string>): void {
  const fields: string[] = [];
  const arrays: z.ZodType[] = [];
  let leaf = false;
  for (const s of schemas) {
    const def = defOf(s);
    if (def.type === 'object' && def.shape) {
      for (const key of Object.keys(def.shape)) if (!fields.includes(key)) fields.push(key);
    } else if (def.type === 'array' && def.element) arrays.push(...alternatives(def.element));
    else leaf = true;
  }
  if (leaf && prefix && !seen.has(prefix)) {
    seen.add(prefix);
    into.push(prefix);
  }
  for (const key of fields) {
    const path = prefix ? `${prefix}.${key}` : key;
    columnsOf(step(schemas, key), path, width, into, seen);
  }
  if (arrays.length) {
    for (let i = 0; i < width(prefix); i++) columnsOf(arrays, `${prefix}.${i}`, width, into, seen);
  }
}

/** An array path with its indexes taken out (`staircase.flights.0.treads` → `staircase.flights.treads`). */
const arrayKey = (path: string) => path.replace(/\.\d+(?=\.|$)/g, '');

/**
 * The columns of a stair row, `ref` first, derived from the estimate request schema. Arrays get
 * as many indexed columns as the widest of `requests` needs (DEFAULT_ARRAY_COLUMNS without them),
 * so a file written from these requests has every column its rows use. `omit` leaves out
 * top-level fields (the template omits `catalog`: rows are priced from a stored catalog).
 */
export function stairRowColumns(requests: readonly unknown[] = [], options: { omit?: readonly string[] } = {}): string[] {
  const widths = new Map<string, number>();
  const measure = (value: unknown, path: string) => {
    if (Array.isArray(value)) {
      widths.set(arrayKey(path), Math.max(widths.get(arrayKey(path)) ?? 0, value.length));
      value.forEach((v, i) => measure(v, `${path}.${i}`));
    } else if (value !== null && typeof value === 'object') {
      for (const [k, v] of Object.entries(value)) measure(v, path ? `${path}.${k}` : k);
    }
  };
  for (const r of requests) measure(r, '');
  const columns: string[] = [REF_COLUMN];
  const width = (path: string) => (requests.length ? (widths.get(arrayKey(path)) ?? 0) : DEFAULT_ARRAY_COLUMNS);
  columnsOf(alternatives(estimateRequestSchema), '', width, columns, new Set([REF_COLUMN]));
  const omitted = options.omit ?? [];
  return columns.filter((c) => !omitted.some((top) => c === top || c.startsWith(`${top}.`)));
}

// ---- rows ---------------------------------------------------------------------------------------

/** The request flattened to its columns (typed cells); `ref` when given. Nothing else is added. */
export function requestToRow(request: unknown, ref?: string): StairRow {
  const row: StairRow = {};
  if (ref !== undefined) row[REF_COLUMN] = ref;
  const flatten = (value: unknown, path: string) => {
    if (Array.isArray(value)) value.forEach((v, i) => flatten(v, `${path}.${i}`));
    else if (value !== null && typeof value === 'object') for (const [k, v] of Object.entries(value)) flatten(v, path ? `${path}.${k}` : k);
    else if (value !== undefined && path) row[path] = value as StairRowCell;
  };
  flatten(request, '');
  return row;
}

/**
 * A row back to `{ ref, request }`: each non-empty cell set at its dotted path (a numeric segment
 * under an array is an index), text turned into the number or boolean the schema expects there.
 * Empty cells are omitted, so the schema's defaults apply. The request is not validated here:
 * run it through estimateRequestSchema, whose error paths are the column names.
 */
export function rowToRequest(row: StairRow): StairRowRequest {
  const request: Record<string, unknown> = {};
  let ref: string | undefined;
  for (const [column, cell] of Object.entries(row)) {
    if (cell === undefined || cell === null || cell === '') continue;
    if (column === REF_COLUMN) {
      ref = String(cell);
      continue;
    }
    const plan = columnPlan(column);
    if (!plan) continue;
    let parent: Record<string, unknown> | unknown[] = request;
    plan.steps.forEach((step, i) => {
      const key: string | number = step.inArray && Array.isArray(parent) ? Number(step.segment) : step.segment;
      const holder = parent as Record<string | number, unknown>;
      if (i === plan.steps.length - 1) {
        holder[key] = typeof cell === 'string' ? typedCell(cell, plan.kinds) : cell;
        return;
      }
      if (holder[key] === undefined || typeof holder[key] !== 'object' || holder[key] === null) holder[key] = step.nextIsIndex ? [] : {};
      parent = holder[key] as Record<string, unknown> | unknown[];
    });
  }
  return ref === undefined ? { request } : { ref, request };
}

/** How a column's path is walked: per segment, whether it indexes an array; the kinds its cell may be. */
interface ColumnPlan {
  steps: { segment: string; inArray: boolean; nextIsIndex: boolean }[];
  kinds: Set<LeafKind>;
}

/** Plans by column name: a file repeats its columns on every row, and walking the schema is most of a row's cost. */
const plans = new Map<string, ColumnPlan | null>();
const MAX_PLANS = 10_000;

function columnPlan(column: string): ColumnPlan | null {
  const known = plans.get(column);
  if (known !== undefined) return known;
  const segments = column.split('.');
  let plan: ColumnPlan | null = null;
  if (!segments.some((s) => s === '' || s === '__proto__' || s === 'constructor' || s === 'prototype')) {
    let schemas = alternatives(estimateRequestSchema);
    const steps: ColumnPlan['steps'] = [];
    segments.forEach((segment, i) => {
      const inArray = schemas.some((s) => defOf(s).type === 'array') && /^\d+$/.test(segment);
      schemas = step(schemas, segment);
      const nextIsIndex = i < segments.length - 1 && schemas.some((s) => defOf(s).type === 'array') && /^\d+$/.test(segments[i + 1]!);
      steps.push({ segment, inArray, nextIsIndex });
    });
    plan = { steps, kinds: leafKinds(schemas) };
  }
  if (plans.size >= MAX_PLANS) plans.clear();
  plans.set(column, plan);
  return plan;
}
