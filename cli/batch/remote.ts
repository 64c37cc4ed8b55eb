import { randomUUID } from 'node:crypto';
import { createWriteStream, existsSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import { z } from 'zod';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import type { ApiTarget } from '../target.js';
import type { BatchInput } from './input.js';
import { createJobsClient, TERMINAL_STATUSES, type Batch } from './jobs-client.js';
import type { Progress } from './progress.js';
import { readBriefs } from './results-file.js';
import { Interrupted, sleep, type RetryPolicy } from './retry.js';
import type { BatchFormat } from './size-chunk.js';
import type { RunSummary } from './summary.js';

/** Polling starts quick (small jobs finish in a moment) and backs off to this interval. */
const FIRST_POLL_MS = 250;
const MAX_POLL_MS = 2000;
/** Tries of the whole results download (a connection cut mid-stream starts it again). */
const DOWNLOAD_ATTEMPTS = 3;

/** Beside the output: which job writes it, so `--resume` re-attaches instead of starting another. */
export const stateFileOf = (output: string) => `${output}.treadwise-batch.json`;

const stateSchema = z.object({ jobId: z.string().min(1), apiUrl: z.string(), format: z.enum(['csv', 'ndjson']), detail: z.enum(['summary', 'full']), input: z.string(), createdAt: z.string() });
type JobState = z.output<typeof stateSchema>;

export interface RemoteRun {
  io: CliIo;
  target: Required<ApiTarget>;
  input: BatchInput;
  output: string;
  format: BatchFormat;
  detail: 'summary' | 'full';
  name?: string;
  resume: boolean;
  cancelOnInterrupt: boolean;
  /** Aborted on Ctrl-C. */
  signal: AbortSignal;
  progress: Progress;
  summary: RunSummary;
  retry?: RetryPolicy;
  /** The command to print for re-attaching. */
  resumeCommand: string;
}

export interface RemoteOutcome {
  job: Batch;
}

function readState(file: string): JobState {
  let parsed: unknown;
  try {
    parsed = JSON.parse(readFileSync(file, 'utf8'));
  } catch {
    throw new CliError(`${file} is not a batch state file; remove it to start again`, EXIT.usage);
  }
  const state = stateSchema.safeParse(parsed);
  if (!state.success) throw new CliError(`${file} is not a batch state file; remove it to start again`, EXIT.usage);
  return state.data;
}

/**
 * Runs the input as a batch job on the API: upload (or re-attach with --resume), poll until the
 * job ends, stream its results into the output, then read them back for the summary. Ctrl-C stops
 * polling and leaves the job running (or cancels it with --cancel-on-interrupt).
 */
export async function runRemote(run: RemoteRun): Promise<RemoteOutcome> {
  const { io } = run;
  const stateFile = stateFileOf(run.output);
  const onRetry = ({ waitMs, reason }: { waitMs: number; reason: string }) => io.err(`batch: ${reason}, trying again in ${(waitMs / 1000).toFixed(1)} s`);
  const client = createJobsClient(io, run.target, { retry: run.retry, signal: run.signal, onRetry });

  let job: Batch;
  if (run.resume) {
    if (!existsSync(stateFile)) throw new CliError(`nothing to resume: ${stateFile} does not exist (the job finished, or never started)`, EXIT.usage);
    const state = readState(stateFile);
    if (state.apiUrl !== run.target.apiUrl) throw new CliError(`the job in ${stateFile} runs on ${state.apiUrl}, not ${run.target.apiUrl}`, EXIT.usage);
    if (state.format !== run.format) throw new CliError(`the job in ${stateFile} writes ${state.format}, not ${run.format}`, EXIT.usage);
    job = await interruptible(client.get(state.jobId), () => {
      throw new CliError(`interrupted; the job ${state.jobId} keeps running. Re-attach with: ${run.resumeCommand}`, 130);
    });
    io.err(`batch: re-attached to job ${job.id} (${job.status}, ${job.rows.done} rows done)`);
  } else {
    if (existsSync(stateFile)) {
      const state = readState(stateFile);
      throw new CliError(`the batch job ${state.jobId} already writes ${run.output}: add --resume to re-attach, or remove ${stateFile} to start another`, EXIT.usage);
    }
    job = await interruptible(client.create(run.input, run.detail, { name: run.name, idempotencyKey: randomUUID() }), () => {
      throw new CliError('interrupted while uploading; no job was started (or it was, and runs without a state file: see treadwise batch jobs on the API)', 130);
    });
    const state: JobState = { jobId: job.id, apiUrl: run.target.apiUrl, format: run.format, detail: run.detail, input: run.input.name, createdAt: new Date().toISOString() };
    writeFileSync(stateFile, `${JSON.stringify(state, null, 2)}\n`);
    io.err(`batch: job ${job.id} created (${run.detail}); state in ${stateFile}`);
  }

  let interval = FIRST_POLL_MS;
  try {
    while (!TERMINAL_STATUSES.has(job.status)) {
      run.progress.update(job.rows.done, job.rows.total ?? null);
      await sleep(interval, run.signal);
      interval = Math.min(MAX_POLL_MS, Math.round(interval * 1.5));
      job = await client.get(job.id);
    }
    run.progress.update(job.rows.done, job.rows.total ?? null);
  } catch (err) {
    if (!(err instanceof Interrupted || run.signal.aborted)) throw err;
    run.progress.stop();
    if (run.cancelOnInterrupt) {
      // A client of its own: the run's signal is aborted, the cancel must still go out.
      const cancelled = await createJobsClient(io, run.target, { retry: run.retry, onRetry }).cancel(job.id);
      rmSync(stateFile, { force: true });
      throw new CliError(`interrupted: job ${cancelled.id} cancelled (${cancelled.rows.done} rows done)`, 130);
    }
    throw new CliError(`interrupted; the job ${job.id} keeps running on the server. Re-attach with: ${run.resumeCommand}`, 130);
  }
  run.progress.stop();

  await download(run, client, job);
  for await (const brief of readBriefs(run.output, run.format)) run.summary.add(brief);
  rmSync(stateFile, { force: true });
  return { job };
}

/** The call, or `onInterrupt` when Ctrl-C came during it. */
async function interruptible<T>(call: Promise<T>, onInterrupt: () => never): Promise<T> {
  try {
    return await call;
  } catch (err) {
    if (err instanceof Interrupted || (err as Error).name === 'AbortError') onInterrupt();
    throw err;
  }
}

/** Streams the results into the output file; a download cut short starts again from the top. */
async function download(run: RemoteRun, client: ReturnType<typeof createJobsClient>, job: Batch): Promise<void> {
  for (let attempt = 1; ; attempt++) {
    try {
      const response = await client.results(job.id, run.format);
      if (!response.body) throw new CliError('the API answered no results body');
      await pipeline(Readable.fromWeb(response.body as import('node:stream/web').ReadableStream), createWriteStream(run.output));
      return;
    } catch (err) {
      if (run.signal.aborted) throw new CliError(`interrupted while downloading; the results stay on the server. Fetch them with: ${run.resumeCommand}`, 130);
      if (err instanceof CliError || attempt >= DOWNLOAD_ATTEMPTS) throw err;
      run.io.err(`batch: results download cut short (${(err as Error).message}), starting it again`);
    }
  }
}
