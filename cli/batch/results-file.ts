import { createReadStream, existsSync, statSync, truncateSync } from 'node:fs';
import { parse } from 'csv-parse';
import type { EstimateBatchItemResult } from '../../shared/schemas/estimate-batch.js';
import { BATCH_RESULT_COLUMNS } from '../../shared/sizing/batch/result-row.js';
import { unguardCell, writeCsv } from '../../shared/tables/csv.js';
import { CliError, EXIT } from '../errors.js';
import type { BatchFormat } from './size-chunk.js';

/** What the summary needs of one result row, from a sized item or read back from a results file. */
export interface RowBrief {
  row: number;
  ref: string | null;
  status: 'ok' | 'error';
  failingChecks: string[];
  problem?: { code: string; detail: string; errors: string | null };
}

export function briefOf(item: EstimateBatchItemResult): RowBrief {
  if (item.status === 'ok') return { row: item.index + 1, ref: item.ref, status: 'ok', failingChecks: item.failingChecks };
  return {
    row: item.index + 1,
    ref: item.ref,
    status: 'error',
    failingChecks: [],
    problem: { code: item.problem.code, detail: item.problem.detail, errors: item.problem.errors?.map((e) => `${e.path}: ${e.message}`).join('; ') ?? null },
  };
}

/** The first bytes of a CSV results file: BOM and header, exactly as the API's results route writes them. */
export const CSV_RESULTS_HEAD = writeCsv([[...BATCH_RESULT_COLUMNS]]);

/**
 * How much of a results file is whole: the byte length up to the end of its last complete row, and
 * how many rows that is (header not counted). A CSV row ends at a CRLF outside quotes (the writer
 * quotes any cell holding a line break); an NDJSON row at a line feed (JSON text holds none raw).
 */
export async function completePart(file: string, format: BatchFormat): Promise<{ bytes: number; records: number }> {
  let offset = 0;
  let bytes = 0;
  let records = 0;
  let inQuotes = false;
  let previous = 0;
  for await (const chunk of createReadStream(file) as AsyncIterable<Buffer>) {
    for (let i = 0; i < chunk.length; i++) {
      const byte = chunk[i]!;
      if (format === 'csv' && byte === 0x22) inQuotes = !inQuotes;
      else if (byte === 0x0a && !inQuotes && (format === 'ndjson' || previous === 0x0d)) {
        records++;
        bytes = offset + i + 1;
      }
      previous = byte;
    }
    offset += chunk.length;
  }
  return { bytes, records: format === 'csv' ? Math.max(0, records - 1) : records };
}

/** Each row of a (complete) results file as a brief, in file order. */
export async function* readBriefs(file: string, format: BatchFormat): AsyncGenerator<RowBrief> {
  if (format === 'ndjson') {
    let rest = '';
    const decoder = new TextDecoder();
    for await (const chunk of createReadStream(file) as AsyncIterable<Buffer>) {
      const lines = (rest + decoder.decode(chunk, { stream: true })).split('\n');
      rest = lines.pop()!;
      for (const line of lines) if (line) yield briefOf(JSON.parse(line) as EstimateBatchItemResult);
    }
    return;
  }
  const column = (name: (typeof BATCH_RESULT_COLUMNS)[number]) => BATCH_RESULT_COLUMNS.indexOf(name);
  const text = (cells: string[], name: (typeof BATCH_RESULT_COLUMNS)[number]) => unguardCell(cells[column(name)] ?? '');
  const list = (value: string) => (value ? value.split(';') : []);
  let header = true;
  for await (const cells of createReadStream(file).pipe(parse({ bom: true, relax_column_count: true })) as AsyncIterable<string[]>) {
    if (header) {
      header = false;
      continue;
    }
    const status = text(cells, 'status') === 'ok' ? 'ok' : 'error';
    const ref = text(cells, 'ref');
    yield {
      row: Number(cells[column('row')]),
      ref: ref === '' ? null : ref,
      status,
      failingChecks: status === 'ok' ? list(text(cells, 'failingChecks')) : [],
      ...(status === 'error'
        ? { problem: { code: text(cells, 'problemCode'), detail: text(cells, 'problemDetail'), errors: text(cells, 'problemErrors') || null } }
        : {}),
    };
  }
}

/**
 * Prepares a results file for `--resume`: cuts a row left half-written, checks the file is this
 * format's results with its rows numbered 1, 2, 3 … in order, and returns how many rows it holds
 * (0 when the file is missing or empty: the run starts from the top).
 */
export async function resumableRows(file: string, format: BatchFormat, onRow: (brief: RowBrief) => void = () => {}): Promise<number> {
  if (!existsSync(file) || statSync(file).size === 0) return 0;
  const { bytes, records } = await completePart(file, format);
  const refuse = (why: string) =>
    new CliError(`${file} cannot be resumed: ${why}. Remove it, or run without --resume to start again`, EXIT.usage);
  if (format === 'csv') {
    const expectedHead = Buffer.from(CSV_RESULTS_HEAD);
    let head = Buffer.alloc(0);
    for await (const chunk of createReadStream(file, { start: 0, end: expectedHead.length - 1 }) as AsyncIterable<Buffer>) head = Buffer.concat([head, chunk]);
    if (!expectedHead.subarray(0, head.length).equals(head)) throw refuse('it does not start with the batch results header');
    if (head.length < expectedHead.length) {
      truncateSync(file, 0); // stopped while writing the header: start afresh
      return 0;
    }
  }
  if (bytes < statSync(file).size) truncateSync(file, bytes);
  let expected = 1;
  try {
    for await (const brief of readBriefs(file, format)) {
      if (brief.row !== expected) throw refuse(`row ${expected} is followed by row ${brief.row}`);
      onRow(brief);
      expected++;
    }
  } catch (err) {
    if (err instanceof SyntaxError) throw refuse(`line ${expected} is not a result row`);
    throw err;
  }
  return records;
}
