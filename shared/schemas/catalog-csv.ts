import { parse } from 'csv-parse/sync';
import type { z } from 'zod';
import { unguardCell, writeCsv, type CsvCell } from '../tables/csv.js';
import { zodFieldErrors } from './check-input.js';
import { storedCatalogItemSchema, toMinorUnits, type StoredCatalogItem } from './catalog-store.js';
import { catalogItemSchema } from './catalog.js';
import { hasControlCharacter } from './text.js';

/**
 * The catalog as CSV: one row per item, one column per field of any kind (nested fields such as a
 * controller's profile as `profile.outputs`). Cells of fields an item's kind lacks stay empty.
 * Written by the shared CSV writer (shared/tables/csv.ts: RFC 4180, CRLF, UTF-8 with BOM, the
 * formula-injection guard) and read back with csv-parse, which strips the guard again. Pure (no
 * I/O), so the API's catalog import and `treadwise batch --local --catalog` read a file alike.
 */

type CellType = 'text' | 'number' | 'boolean';
export interface CsvColumn {
  name: string;
  type: CellType;
}

/** Unwraps optional/default to the field's own schema. */
function inner(schema: z.ZodType): z.ZodType {
  let s = schema as unknown as { _zod: { def: { type: string; innerType?: z.ZodType } } };
  while (s._zod.def.type === 'optional' || s._zod.def.type === 'default' || s._zod.def.type === 'nullable') s = s._zod.def.innerType as never;
  return s as unknown as z.ZodType;
}

function leafColumns(shape: Record<string, z.ZodType>, prefix: string, out: Map<string, CellType>): void {
  for (const [key, field] of Object.entries(shape)) {
    const s = inner(field) as unknown as { _zod: { def: { type: string; shape?: Record<string, z.ZodType> } } };
    const name = prefix + key;
    const type = s._zod.def.type;
    if (type === 'object' && s._zod.def.shape) leafColumns(s._zod.def.shape, `${name}.`, out);
    else if (!out.has(name)) out.set(name, type === 'number' ? 'number' : type === 'boolean' ? 'boolean' : 'text');
  }
}

/** Every column, in a fixed order: the shared ones first, then each kind's fields as first met. */
export const CATALOG_CSV_COLUMNS: readonly CsvColumn[] = (() => {
  const out = new Map<string, CellType>([
    ['sku', 'text'],
    ['kind', 'text'],
    ['description', 'text'],
    ['unitPrice', 'number'],
    ['active', 'boolean'],
  ]);
  for (const option of storedCatalogItemSchema.options) leafColumns(option.shape as Record<string, z.ZodType>, '', out);
  return [...out].map(([name, type]) => ({ name, type }));
})();
const COLUMN_BY_NAME = new Map(CATALOG_CSV_COLUMNS.map((c) => [c.name, c]));

function flatten(value: Record<string, unknown>, prefix = '', out: Record<string, unknown> = {}): Record<string, unknown> {
  for (const [key, v] of Object.entries(value)) {
    if (v !== null && typeof v === 'object' && !Array.isArray(v)) flatten(v as Record<string, unknown>, `${prefix}${key}.`, out);
    else out[prefix + key] = v;
  }
  return out;
}

/** Every kind's schema, in the order of the inline catalog's union. */
const KIND_SCHEMAS = catalogItemSchema.options;

export function catalogCsv(items: readonly StoredCatalogItem[]): string {
  const rows = items.map((item) => {
    const flat = flatten(item as Record<string, unknown>);
    return CATALOG_CSV_COLUMNS.map(({ name, type }): CsvCell => {
      const v = flat[name];
      if (v === undefined || v === null) return null;
      // A text column's value is always written (and guarded) as text, even one that looks like a number.
      return type !== 'text' && (typeof v === 'number' || typeof v === 'boolean') ? v : String(v);
    });
  });
  return writeCsv([CATALOG_CSV_COLUMNS.map((c) => c.name), ...rows]);
}

/** The template: the header and one example row per kind (the kinds' documented examples). */
export function catalogTemplateCsv(): string {
  const examples = KIND_SCHEMAS.map((schema) => ({ ...(schema.meta()?.example as StoredCatalogItem), active: true }));
  return catalogCsv(examples);
}

export interface CsvRowError {
  /** Line of the file (the header is line 1). */
  row: number;
  /** The column, e.g. `unitPrice` or `profile.outputs`; `(row)` for the row as a whole. */
  column: string;
  message: string;
}

export class CsvNotReadable extends Error {}

/** Most row errors one answer lists. */
export const MAX_CSV_ERRORS = 500;

function cellValue(column: CsvColumn, raw: string): { value?: unknown; error?: string } {
  if (column.type === 'number') {
    const trimmed = raw.trim();
    if (!/^-?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(trimmed)) return { error: `not a number: "${raw.slice(0, 40)}"` };
    return { value: Number(trimmed) };
  }
  if (column.type === 'boolean') {
    const v = raw.trim().toLowerCase();
    if (v === 'true') return { value: true };
    if (v === 'false') return { value: false };
    return { error: 'must be true or false' };
  }
  const text = unguardCell(raw);
  if (hasControlCharacter(text)) return { error: 'must not contain control characters' };
  return { value: text };
}

function setPath(target: Record<string, unknown>, path: string, value: unknown): void {
  const parts = path.split('.');
  let node = target;
  for (const part of parts.slice(0, -1)) node = (node[part] ??= {}) as Record<string, unknown>;
  node[parts[parts.length - 1]] = value;
}

/**
 * Reads a catalog CSV: every row checked by its kind's schema, prices checked against the
 * currency's decimals, SKUs unique in the file. Throws CsvNotReadable for what is not CSV at all.
 */
export function readCatalogCsv(data: Uint8Array, currency: string): { items: StoredCatalogItem[]; errors: CsvRowError[]; rows: number } {
  if (data.includes(0)) throw new CsvNotReadable('The file holds binary data (NUL bytes), not CSV text.');
  const text = new TextDecoder('utf-8', { fatal: false }).decode(data);
  if (text.includes('\uFFFD')) throw new CsvNotReadable('The file is not UTF-8 text.');
  let records: string[][];
  try {
    records = parse(text, { bom: true, relax_column_count: false, skip_empty_lines: true });
  } catch (err) {
    throw new CsvNotReadable(`The file is not valid CSV: ${(err as Error).message}`);
  }
  if (records.length === 0) throw new CsvNotReadable('The file is empty: it needs a header row.');
  const header = records[0].map((h) => h.trim());
  const errors: CsvRowError[] = [];
  header.forEach((name) => {
    if (!COLUMN_BY_NAME.has(name)) errors.push({ row: 1, column: name || '(empty)', message: 'unknown column' });
  });
  if (new Set(header).size !== header.length) errors.push({ row: 1, column: '(header)', message: 'a column appears twice' });
  for (const required of ['sku', 'kind']) if (!header.includes(required)) errors.push({ row: 1, column: required, message: 'missing column' });
  if (errors.length) return { items: [], errors, rows: records.length - 1 };

  const items: StoredCatalogItem[] = [];
  const firstRowOfSku = new Map<string, number>();
  for (let i = 1; i < records.length && errors.length < MAX_CSV_ERRORS; i++) {
    const row = i + 1;
    const input: Record<string, unknown> = {};
    let cellErrors = false;
    records[i].forEach((raw, c) => {
      if (raw === '') return; // an empty cell is an absent field
      const column = COLUMN_BY_NAME.get(header[c])!;
      const { value, error } = cellValue(column, raw);
      if (error) {
        errors.push({ row, column: column.name, message: error });
        cellErrors = true;
      } else setPath(input, column.name, value);
    });
    if (cellErrors) continue;
    const parsed = storedCatalogItemSchema.safeParse(input);
    if (!parsed.success) {
      for (const e of zodFieldErrors(parsed.error)) errors.push({ row, column: e.path === '(body)' ? '(row)' : e.path, message: e.path === '(body)' ? e.message : e.message === 'unknown field' ? `not a field of kind ${String(input.kind)}` : e.message });
      continue;
    }
    const item = parsed.data;
    if (item.unitPrice !== undefined && toMinorUnits(item.unitPrice, currency) === null) {
      errors.push({ row, column: 'unitPrice', message: `${currency} prices are whole minor units; ${item.unitPrice} is not` });
      continue;
    }
    const first = firstRowOfSku.get(item.sku);
    if (first !== undefined) {
      errors.push({ row, column: 'sku', message: `SKU ${item.sku} is also on row ${first}` });
      continue;
    }
    firstRowOfSku.set(item.sku, row);
    items.push(item);
  }
  return { items, errors: errors.slice(0, MAX_CSV_ERRORS), rows: records.length - 1 };
}
