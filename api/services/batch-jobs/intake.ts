import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import { parse } from 'csv-parse';
import { batchJobItemSchema } from '../../../shared/schemas/batch-jobs.js';
import { batchRefSchema } from '../../../shared/schemas/estimate-batch.js';
import { checkInput } from '../../../shared/schemas/check-input.js';
import { rowToRequest, type StairRow } from '../../../shared/schemas/stair-row.js';
import { checkBatchItem, type CheckedItem } from '../../../shared/sizing/batch/items.js';
import { unguardCell } from '../../../shared/tables/csv.js';

/**
 * Reading a job's input one row at a time (files are streamed from disk, never held whole), each
 * row checked on its own with the schema POST /v1/estimates uses: a bad row becomes its problem.
 * Only a file that cannot be read at all (not CSV, a broken header) refuses the job.
 */

/** The file cannot be read as the kind it claims to be: the job is refused whole (400 not_csv). */
export class FileNotReadable extends Error {}

/** A row of an uploaded job, numbered from 0 in the order of the file. */
export type IntakeRow = CheckedItem;

const envelopeProblem = (errors: { path: string; message: string }[]) => ({ code: 'validation_failed', detail: 'The line is not a `{ "ref"?, "request" }` object.', errors });

/** One JSON item (`{ ref?, request }`) checked: the envelope, then the request. */
export function checkJobItem(index: number, value: unknown): IntakeRow {
  const envelope = checkInput(batchJobItemSchema, value);
  if (!envelope.ok) return { index, ref: null, problem: envelopeProblem(envelope.errors) };
  return checkBatchItem(index, envelope.data.ref ?? null, envelope.data.request);
}

/** NDJSON: one `{ ref?, request }` per line; blank lines skipped; a line that is not JSON is that row's problem. */
export async function* ndjsonRows(path: string): AsyncGenerator<IntakeRow> {
  const lines = createInterface({ input: createReadStream(path, { encoding: 'utf8' }), crlfDelay: Infinity });
  let index = 0;
  for await (const raw of lines) {
    const line = index === 0 ? raw.replace(/^\uFEFF/, '') : raw;
    if (line.trim() === '') continue;
    let value: unknown;
    try {
      value = JSON.parse(line);
    } catch {
      yield { index, ref: null, problem: { code: 'validation_failed', detail: `Row ${index + 1} is not a JSON object on one line.` } };
      index++;
      continue;
    }
    yield checkJobItem(index, value);
    index++;
  }
}

/** Stair-row CSV (shared/schemas/stair-row.ts) with a header row; each row turned into its request and checked. */
export async function* csvRows(path: string): AsyncGenerator<IntakeRow> {
  const parser = createReadStream(path).pipe(parse({ bom: true, relax_column_count: true, skip_empty_lines: true, max_record_size: 1024 * 1024 }));
  let header: string[] | null = null;
  let index = 0;
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      if (!header) {
        header = record.map((c) => c.trim());
        if (header.length === 0 || header.some((c) => c === '')) throw new FileNotReadable('The header row has an empty column name.');
        const seen = new Set<string>();
        for (const c of header) {
          if (seen.has(c)) throw new FileNotReadable(`The header names the column ${c.slice(0, 80)} twice.`);
          seen.add(c);
        }
        continue;
      }
      if (record.length > header.length && record.slice(header.length).some((c) => c.trim() !== '')) {
        yield { index, ref: null, problem: { code: 'validation_failed', detail: `Row ${index + 1} has ${record.length} cells; the header has ${header.length}.` } };
        index++;
        continue;
      }
      const row: StairRow = {};
      header.forEach((column, i) => {
        const cell = record[i];
        if (cell !== undefined && cell.trim() !== '') row[column] = unguardCell(cell.trim());
      });
      const { ref, request } = rowToRequest(row);
      const refChecked = ref === undefined ? null : checkInput(batchRefSchema, ref);
      if (refChecked && !refChecked.ok) {
        yield { index, ref: null, problem: { code: 'validation_failed', detail: 'The ref cell is not a valid reference.', errors: refChecked.errors.map((e) => ({ path: 'ref', message: e.message })) } };
      } else {
        yield checkBatchItem(index, refChecked?.ok ? refChecked.data : null, request);
      }
      index++;
    }
  } catch (err) {
    if (err instanceof FileNotReadable) throw err;
    if (err && typeof err === 'object' && 'code' in err && String((err as { code: unknown }).code).startsWith('CSV_')) {
      throw new FileNotReadable(`The file is not readable as CSV: ${String((err as { message?: unknown }).message).slice(0, 200)}`);
    }
    throw err;
  }
  if (!header) throw new FileNotReadable('The file is empty: it needs a header row and at least one stair.');
}

/** Items of a JSON body, checked one by one. */
export function* jsonRows(items: readonly unknown[]): Generator<IntakeRow> {
  for (let index = 0; index < items.length; index++) yield checkJobItem(index, items[index]);
}
