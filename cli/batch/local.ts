import { createWriteStream, existsSync, openSync, statSync, type WriteStream } from 'node:fs';
import type { Catalog } from '../../shared/schemas/catalog.js';
import type { BatchDetail } from '../../shared/schemas/estimate-batch.js';
import { csvRecords, ndjsonLines, type BatchInput } from './input.js';
import { createChunkPool } from './pool.js';
import type { Progress } from './progress.js';
import { briefOf, CSV_RESULTS_HEAD, resumableRows } from './results-file.js';
import type { BatchFormat, ChunkResult, ChunkTask } from './size-chunk.js';
import type { RunSummary } from './summary.js';

/** Rows per worker task: large enough that messages cost little, small enough to keep every thread busy. */
export const DEFAULT_CHUNK_ROWS = 250;

export interface LocalRun {
  input: BatchInput;
  output: string;
  format: BatchFormat;
  detail: BatchDetail;
  catalog: Catalog | null;
  concurrency: number;
  resume: boolean;
  chunkRows?: number;
  summary: RunSummary;
  progress: Progress;
  total: number | null;
  /** Asked before each chunk is handed out: true once Ctrl-C was pressed. */
  interrupted(): boolean;
}

export interface LocalOutcome {
  /** Rows the output held before this run (resume). */
  skipped: number;
  /** Rows sized by this run. */
  sized: number;
  interrupted: boolean;
}

function write(stream: WriteStream, text: string): Promise<void> {
  return new Promise((resolve, reject) => {
    if (stream.write(text)) resolve();
    else {
      stream.once('drain', resolve);
      stream.once('error', reject);
    }
  });
}

/**
 * Sizes every row of the input on the worker pool and writes the results in row order, chunk by
 * chunk (workers finish out of order; finished chunks wait for the ones before them). At most
 * two chunks per thread are under way, so memory stays flat however large the input.
 */
export async function runLocal(run: LocalRun): Promise<LocalOutcome> {
  const skipped = run.resume ? await resumableRows(run.output, run.format, (b) => run.summary.add(b)) : 0;
  const fresh = !run.resume || !existsSync(run.output) || statSync(run.output).size === 0;
  // Opened at once, so a folder that does not exist is an error here, not in a stream later.
  const out = createWriteStream('', { fd: openSync(run.output, fresh ? 'w' : 'a') });
  const outClosed = new Promise<void>((resolve, reject) => {
    out.once('close', resolve);
    out.once('error', reject);
  });
  if (fresh && run.format === 'csv') await write(out, CSV_RESULTS_HEAD);

  const pool = createChunkPool(run.concurrency);
  const chunkRows = run.chunkRows ?? DEFAULT_CHUNK_ROWS;
  const maxInFlight = run.concurrency * 2;
  const finished = new Map<number, ChunkResult>();
  const inFlight = new Set<Promise<void>>();
  let nextToWrite = 0;
  let dispatched = 0;
  let sized = 0;
  let failure: unknown;
  let writing = Promise.resolve();
  run.progress.update(skipped, run.total);

  /** Writes every finished chunk that is next in order. */
  const flush = async () => {
    while (finished.has(nextToWrite)) {
      const result = finished.get(nextToWrite)!;
      finished.delete(nextToWrite);
      nextToWrite++;
      await write(out, result.text);
      for (const item of result.items) run.summary.add(briefOf(item));
      sized += result.items.length;
      run.progress.update(skipped + sized, run.total);
    }
  };

  const dispatch = async (task: Omit<ChunkTask, 'detail' | 'format' | 'catalog'>) => {
    while (inFlight.size >= maxInFlight) await Promise.race(inFlight);
    if (failure) throw failure;
    const seq = dispatched++;
    const job = pool
      .run({ ...task, detail: run.detail, format: run.format, catalog: run.catalog } as ChunkTask)
      .then((result) => {
        finished.set(seq, result);
        writing = writing.then(flush);
        return writing;
      })
      .catch((err) => {
        failure ??= err;
      })
      .finally(() => inFlight.delete(job));
    inFlight.add(job);
  };

  let interrupted = false;
  let index = 0;
  try {
    if (run.input.kind === 'csv') {
      let header: string[] | undefined;
      let records: string[][] = [];
      let first = 0;
      for await (const record of csvRecords(run.input)) {
        if (!header) {
          header = record;
          continue;
        }
        if (index++ < skipped) continue;
        if (records.length === 0) first = index - 1;
        records.push(record);
        if (records.length >= chunkRows) {
          if ((interrupted = run.interrupted())) break;
          await dispatch({ first, input: { kind: 'csv', header, records } });
          records = [];
        }
      }
      if (!interrupted && header && records.length && !(interrupted = run.interrupted())) await dispatch({ first, input: { kind: 'csv', header, records } });
    } else {
      let lines: string[] = [];
      let first = 0;
      for await (const line of ndjsonLines(run.input)) {
        if (index++ < skipped) continue;
        if (lines.length === 0) first = index - 1;
        lines.push(line);
        if (lines.length >= chunkRows) {
          if ((interrupted = run.interrupted())) break;
          await dispatch({ first, input: { kind: 'ndjson', lines } });
          lines = [];
        }
      }
      if (!interrupted && lines.length && !(interrupted = run.interrupted())) await dispatch({ first, input: { kind: 'ndjson', lines } });
    }
  } finally {
    // Rows already handed out are finished and written, also on Ctrl-C or a bad input file.
    await Promise.all(inFlight);
    await writing;
    out.end();
    await outClosed;
    await pool.close();
  }
  if (failure) throw failure;
  return { skipped, sized, interrupted };
}
