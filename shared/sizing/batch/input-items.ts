import { checkInput } from '../../schemas/check-input.js';
import { batchRefSchema, estimateBatchItemSchema } from '../../schemas/estimate-batch.js';
import { rowToRequest, type StairRow } from '../../schemas/stair-row.js';
import { unguardCell } from '../../tables/csv.js';
import { checkBatchItem, type CheckedItem } from './items.js';

/**
 * The rows of a batch file (a stair-row CSV or NDJSON of `{ ref?, request }` lines) as checked
 * items. A row that cannot be read is that row's own problem, never the file's: only a file that
 * is not CSV or NDJSON at all, or a CSV whose header is unusable, is refused whole (see
 * `stairRowHeaderProblems`). `index` counts data rows from 0 (header and blank lines not counted).
 */

/** Why a stair-row CSV's header cannot be used (empty: it can). Columns are trimmed before this. */
export function stairRowHeaderProblems(header: readonly string[]): string[] {
  const problems: string[] = [];
  if (header.length === 0 || header.every((c) => c === '')) problems.push('the header row is empty');
  if (header.some((c) => c === '')) problems.push('a header cell is empty');
  const seen = new Set<string>();
  for (const column of header) {
    if (column !== '' && seen.has(column)) problems.push(`column ${column} appears twice`);
    seen.add(column);
  }
  return problems;
}

/** The stair's reference, when valid; a bad one (too long, control characters) is the row's problem. */
function checkedRef(index: number, ref: string | undefined): { ref: string | null } | { item: CheckedItem } {
  if (ref === undefined) return { ref: null };
  const checked = checkInput(batchRefSchema, ref);
  if (checked.ok) return { ref: checked.data };
  return {
    item: {
      index,
      ref: null,
      problem: { code: 'validation_failed', detail: 'The stair reference is not valid.', errors: checked.errors.map((e) => ({ path: 'ref', message: e.message })) },
    },
  };
}

/**
 * One data record of a stair-row CSV (cells as text, under the trimmed header): guard apostrophes
 * removed, empty cells omitted, then `rowToRequest` and the estimate request's own checks. A record
 * with more cells than the header has columns is refused; a shorter one has its last cells empty.
 */
export function csvRecordItem(index: number, header: readonly string[], cells: readonly string[]): CheckedItem {
  if (cells.length > header.length) {
    return {
      index,
      ref: null,
      problem: {
        code: 'validation_failed',
        detail: 'The row has more cells than the header has columns.',
        errors: [{ path: '(row)', message: `${cells.length} cells under ${header.length} columns` }],
      },
    };
  }
  const row: StairRow = {};
  cells.forEach((cell, i) => {
    if (cell !== '') row[header[i]!] = unguardCell(cell);
  });
  const { ref, request } = rowToRequest(row);
  const checked = checkedRef(index, ref);
  if ('item' in checked) return checked.item;
  return checkBatchItem(index, checked.ref, request);
}

/** One non-blank NDJSON line: `{ "ref"?: string, "request": EstimateRequest }` as POST /v1/estimates/batch takes an item. */
export function ndjsonLineItem(index: number, line: string): CheckedItem {
  let value: unknown;
  try {
    value = JSON.parse(line);
  } catch (err) {
    return { index, ref: null, problem: { code: 'validation_failed', detail: 'The line is not valid JSON.', errors: [{ path: '(line)', message: (err as Error).message }] } };
  }
  const item = checkInput(estimateBatchItemSchema, value);
  if (!item.ok) return { index, ref: null, problem: { code: 'validation_failed', detail: 'The line is not a batch item ({ "ref"?, "request" }).', errors: item.errors } };
  return checkBatchItem(index, item.data.ref ?? null, item.data.request);
}
