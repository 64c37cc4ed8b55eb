import { openAsBlob } from 'node:fs';
import path from 'node:path';
import { z } from 'zod';
import { API_VERSION } from '../../api/version.js';
import { problemLine, unreachable } from '../api-client.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import type { ApiTarget } from '../target.js';
import type { BatchInput } from './input.js';
import { withRetries, type RetryNotice, type RetryPolicy } from './retry.js';
import type { BatchFormat } from './size-chunk.js';

/**
 * A thin typed client for the batch job routes (POST /v1/batches, GET /v1/batches/{id},
 * GET …/results, POST …/cancel), written to the batch contract. The generated openapi types do
 * not hold these routes yet; once they do, this can move onto the typed client of api-client.ts.
 * Answers are checked with an open schema (new fields never break it).
 */

export const BATCH_STATUSES = ['queued', 'running', 'succeeded', 'stopped', 'cancelled', 'failed'] as const;
export const TERMINAL_STATUSES: ReadonlySet<string> = new Set(['succeeded', 'stopped', 'cancelled', 'failed']);

const count = z.number().int().min(0);
export const batchSchema = z.object({
  id: z.string().min(1),
  name: z.string().nullable().optional(),
  status: z.enum(BATCH_STATUSES),
  stopReason: z.string().nullable().optional(),
  detail: z.enum(['summary', 'full']).optional(),
  rows: z.object({ total: count.nullable().optional(), done: count, ok: count, failed: count, withFailingChecks: count }),
  progress: z.number().nullable().optional(),
  rowsPerSecond: z.number().nullable().optional(),
  etaSeconds: z.number().nullable().optional(),
  engineVersion: z.string().optional(),
  catalogVersion: z.number().nullable().optional(),
});
export type Batch = z.output<typeof batchSchema>;

const CONTENT_TYPES: Record<BatchInput['kind'], string> = { csv: 'text/csv', ndjson: 'application/x-ndjson' };
const JSON_TIMEOUT_MS = 60_000;

export interface JobsClientOptions {
  retry?: RetryPolicy;
  /** Aborts waits between retries (Ctrl-C). */
  signal?: AbortSignal;
  onRetry?: (notice: RetryNotice) => void;
}

export function createJobsClient(io: CliIo, target: Required<ApiTarget>, opts: JobsClientOptions = {}) {
  const base = target.apiUrl.replace(/\/+$/, '');
  const headers = { 'user-agent': `treadwise-cli/${API_VERSION}`, authorization: `Bearer ${target.apiKey}` };


  async function call(method: string, route: string, init: { body?: () => Promise<BodyInit>; accept: string; extra?: Record<string, string>; timeout?: boolean }): Promise<Response> {
    const response = await withRetries(
      async () => {
        try {
          return await io.fetch(`${base}${route}`, {
            method,
            headers: { ...headers, accept: init.accept, ...init.extra },
            body: init.body ? await init.body() : undefined,
            signal: init.timeout === false ? opts.signal : AbortSignal.any([AbortSignal.timeout(JSON_TIMEOUT_MS), ...(opts.signal ? [opts.signal] : [])]),
          });
        } catch (err) {
          throw unreachable(base, err);
        }
      },
      { policy: opts.retry, signal: opts.signal, onRetry: opts.onRetry },
    );
    if (!response.ok) {
      const text = await response.text().catch(() => '');
      let body: unknown = text;
      try {
        body = JSON.parse(text);
      } catch {
        // not problem+json: the status line is shown
      }
      throw new CliError(problemLine(body, response), response.status === 400 || response.status === 413 || response.status === 415 ? EXIT.usage : EXIT.failure);
    }
    return response;
  }

  const batchOf = async (response: Response): Promise<Batch> => {
    const body: unknown = await response.json();
    const parsed = batchSchema.safeParse(body);
    if (!parsed.success) throw new CliError(`the API answered a batch job the CLI cannot read (${parsed.error.issues[0]?.message ?? 'bad shape'})`);
    return parsed.data;
  };

  return {
    /** Uploads the file (streamed from disk, re-read on a retry); the Idempotency-Key makes a retried POST one job. */
    async create(input: BatchInput, detail: 'summary' | 'full', options: { name?: string; idempotencyKey: string }): Promise<Batch> {
      const fileName = input.name === 'stdin' ? `stdin.${input.kind === 'csv' ? 'csv' : 'ndjson'}` : path.basename(input.path);
      const response = await call('POST', `/v1/batches?detail=${detail}`, {
        accept: 'application/json',
        extra: { 'idempotency-key': options.idempotencyKey },
        body: async () => {
          const form = new FormData();
          form.append('file', await openAsBlob(input.path, { type: CONTENT_TYPES[input.kind] }), fileName);
          if (options.name) form.append('name', options.name);
          return form;
        },
        timeout: false,
      });
      return batchOf(response);
    },
    async get(id: string): Promise<Batch> {
      return batchOf(await call('GET', `/v1/batches/${encodeURIComponent(id)}`, { accept: 'application/json' }));
    },
    async cancel(id: string): Promise<Batch> {
      return batchOf(await call('POST', `/v1/batches/${encodeURIComponent(id)}/cancel`, { accept: 'application/json' }));
    },
    /** The results as the API streams them (the body is the caller's to read). */
    async results(id: string, format: BatchFormat): Promise<Response> {
      const accept = format === 'csv' ? 'text/csv' : 'application/x-ndjson';
      return call('GET', `/v1/batches/${encodeURIComponent(id)}/results?format=${format}`, { accept, timeout: false });
    },
  };
}

export type JobsClient = ReturnType<typeof createJobsClient>;
