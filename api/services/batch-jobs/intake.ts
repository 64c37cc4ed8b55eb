import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import { parse } from 'csv-parse';
import { batchJobItemSchema } from '../../../shared/schemas/batch-jobs.js';
import { checkInput } from '../../../shared/schemas/check-input.js';
import { csvRecordItem, ndjsonLineItem, stairRowHeaderProblems } from '../../../shared/sizing/batch/input-items.js';
import { checkBatchItem, type CheckedItem } from '../../../shared/sizing/batch/items.js';

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

/**
 * NDJSON: one `{ ref?, request }` per line; blank lines skipped. Each line is read by the same
 * shared function `treadwise batch --local` uses, so a bad line is the same problem in both.
 */
export async function* ndjsonRows(path: string): AsyncGenerator<IntakeRow> {
  const lines = createInterface({ input: createReadStream(path, { encoding: 'utf8' }), crlfDelay: Infinity });
  let index = 0;
  for await (const raw of lines) {
    const line = index === 0 ? raw.replace(/^\uFEFF/, '') : raw;
    if (line.trim() === '') continue;
    yield ndjsonLineItem(index, line);
    index++;
  }
}

/**
 * Stair-row CSV (shared/schemas/stair-row.ts) with a header row; each record turned into its
 * request and checked by the shared `csvRecordItem`, exactly as `treadwise batch --local` does.
 */
export async function* csvRows(path: string): AsyncGenerator<IntakeRow> {
  const parser = createReadStream(path).pipe(parse({ bom: true, relax_column_count: true, skip_empty_lines: true, max_record_size: 1024 * 1024 }));
  let header: string[] | null = null;
  let index = 0;
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      if (!header) {
        header = record.map((c) => c.trim());
        const problems = stairRowHeaderProblems(header);
        if (problems.length) throw new FileNotReadable(`The header row cannot be used: ${problems.join('; ').slice(0, 300)}.`);
        continue;
      }
      yield csvRecordItem(index, header, record);
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
