import { stringify } from 'csv-stringify/sync';

/**
 * The one CSV writer of Treadwise: every CSV the API hands out (catalog, usage, wiring schedule,
 * bill of materials) goes through here, so they all quote alike (RFC 4180: CRLF, fields with a
 * comma, quote or line break quoted), start with a UTF-8 byte-order mark so spreadsheets read
 * accents and units such as mm², and carry the same formula-injection guard.
 */

/** A cell as the writers hand it over: text is guarded, numbers and booleans never are. */
export type CsvCell = string | number | boolean | null | undefined;
export type CsvRow = readonly CsvCell[];

/**
 * Formula-injection guard: a text cell a spreadsheet would run as a formula (starting with
 * = + - @, tab or CR) gets a leading apostrophe. A text that already starts with an apostrophe
 * before such a character gets one more, so stripping exactly one on import gives back the text.
 * Numbers are written as numbers and never guarded.
 */
const FORMULA_START = /^[=+\-@\t\r]/;
function needsGuard(text: string): boolean {
  return FORMULA_START.test(text) || /^'[=+\-@\t\r']/.test(text);
}

export function guardCell(text: string): string {
  return needsGuard(text) ? `'${text}` : text;
}

/** The reverse of guardCell, for importers: removes exactly the apostrophe the guard added. */
export function unguardCell(text: string): string {
  return text.startsWith("'") && needsGuard(text.slice(1)) ? text.slice(1) : text;
}

/** One cell as written: empty for a missing value, true/false spelt out, text guarded. */
export function csvCell(value: CsvCell): string {
  if (value === null || value === undefined) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  if (typeof value === 'boolean') return value ? 'true' : 'false';
  return guardCell(value);
}

export const BYTE_ORDER_MARK = '\uFEFF';

export interface CsvOptions {
  /**
   * Start with the UTF-8 byte-order mark (default true). Only exports that machines read and that
   * never held one before (the usage export, ASCII only) leave it out, so their readers keep working.
   */
  byteOrderMark?: boolean;
  /** Pad every row with empty cells to the widest one, so a file of several blocks stays rectangular. */
  rectangular?: boolean;
}

/** The rows as one CSV text, every record ended by CRLF. */
export function writeCsv(rows: readonly CsvRow[], options: CsvOptions = {}): string {
  const width = options.rectangular ? Math.max(0, ...rows.map((r) => r.length)) : 0;
  const cells = rows.map((row) => {
    const written = row.map(csvCell);
    while (written.length < width) written.push('');
    return written;
  });
  // csv-stringify quotes a field holding the record delimiter (CRLF) but not a lone CR or LF, which
  // readers take as a line break: any cell with either is quoted.
  const body = stringify(cells, { record_delimiter: '\r\n', quoted_match: /[\r\n]/ });
  return (options.byteOrderMark === false ? '' : BYTE_ORDER_MARK) + body;
}
