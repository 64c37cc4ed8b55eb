import { closeSync, createReadStream, createWriteStream, mkdtempSync, openSync, readSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { parse } from 'csv-parse';
import { stairRowHeaderProblems } from '../../shared/sizing/batch/input-items.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';

export type InputKind = 'csv' | 'ndjson';

/** The batch file on disk (stdin is spooled to a temporary file: uploads are retried, and read twice locally). */
export interface BatchInput {
  path: string;
  /** How messages name it: the path given, or `stdin`. */
  name: string;
  kind: InputKind;
  /** Removes the spooled copy of stdin (nothing for a real file). */
  cleanup(): void;
}

const NDJSON_EXTENSIONS = new Set(['.ndjson', '.jsonl']);

/** By extension (.csv, .ndjson, .jsonl); otherwise the first character: `{` is NDJSON, anything else CSV. */
function kindOf(file: string): InputKind {
  const ext = path.extname(file).toLowerCase();
  if (ext === '.csv') return 'csv';
  if (NDJSON_EXTENSIONS.has(ext)) return 'ndjson';
  const fd = openSync(file, 'r');
  try {
    const head = Buffer.alloc(256);
    const n = readSync(fd, head, 0, head.length, 0);
    const text = head.subarray(0, n).toString('utf8').replace(/^\uFEFF/, '').trimStart();
    return text.startsWith('{') ? 'ndjson' : 'csv';
  } finally {
    closeSync(fd);
  }
}

export async function openBatchInput(io: CliIo, file: string): Promise<BatchInput> {
  if (file !== '-') {
    if (!statSync(file).isFile()) throw new CliError(`${file} is not a file`, EXIT.usage);
    return { path: file, name: file, kind: kindOf(file), cleanup: () => {} };
  }
  const dir = mkdtempSync(path.join(tmpdir(), 'treadwise-batch-'));
  const spooled = path.join(dir, 'stdin');
  const source = io.stdinStream ? io.stdinStream() : Readable.from([await io.readStdin()]);
  await pipeline(source, createWriteStream(spooled));
  return { path: spooled, name: 'stdin', kind: kindOf(spooled), cleanup: () => rmSync(dir, { recursive: true, force: true }) };
}

/** Rows in the file, roughly (line breaks; a quoted break counts too): for the progress bar only. */
export async function approximateRows(input: BatchInput): Promise<number> {
  let breaks = 0;
  let last = 0x0a;
  for await (const chunk of createReadStream(input.path) as AsyncIterable<Buffer>) {
    for (let i = chunk.indexOf(0x0a); i !== -1; i = chunk.indexOf(0x0a, i + 1)) breaks++;
    if (chunk.length) last = chunk[chunk.length - 1]!;
  }
  const lines = breaks + (last === 0x0a ? 0 : 1);
  return Math.max(0, input.kind === 'csv' ? lines - 1 : lines);
}

/** The stair-row CSV's trimmed header and then each data record as text cells; an unreadable file is a usage error. */
export async function* csvRecords(input: BatchInput): AsyncGenerator<string[]> {
  const parser = createReadStream(input.path).pipe(parse({ bom: true, skip_empty_lines: true, relax_column_count: true }));
  let header = true;
  try {
    for await (const record of parser as AsyncIterable<string[]>) {
      if (header) {
        const columns = record.map((c) => c.trim());
        const problems = stairRowHeaderProblems(columns);
        if (problems.length) throw new CliError(`${input.name}: ${problems.join('; ')}`, EXIT.usage);
        header = false;
        yield columns;
      } else {
        yield record;
      }
    }
  } catch (err) {
    if (err instanceof CliError) throw err;
    const code = (err as { code?: string }).code;
    if (code?.startsWith('CSV_')) throw new CliError(`${input.name} is not valid CSV: ${(err as Error).message}`, EXIT.usage);
    throw err;
  }
  if (header) throw new CliError(`${input.name} is empty: a stair-row CSV needs a header row`, EXIT.usage);
}

/** The non-blank lines of an NDJSON file (a CRLF's CR dropped). */
export async function* ndjsonLines(input: BatchInput): AsyncGenerator<string> {
  let rest = '';
  const decoder = new TextDecoder('utf-8');
  let first = true;
  for await (const chunk of createReadStream(input.path) as AsyncIterable<Buffer>) {
    rest += decoder.decode(chunk, { stream: true });
    if (first) {
      rest = rest.replace(/^\uFEFF/, '');
      first = false;
    }
    const lines = rest.split('\n');
    rest = lines.pop()!;
    for (const raw of lines) {
      const line = raw.replace(/\r$/, '');
      if (line.trim()) yield line;
    }
  }
  rest += decoder.decode();
  if (rest.trim()) yield rest.replace(/\r$/, '');
}
