import { z } from 'zod';
import { engineVersionSchema } from './common.js';
import { BATCH_DETAILS, batchRefSchema } from './estimate-batch.js';
import { alderRowCornerUnit, alderRowTownhouse } from './estimate-examples.js';
import { nameText } from './text.js';

/**
 * Batch jobs: up to MAX_JOB_ROWS stairs sized in the background (`POST /v1/batches`), read back
 * as NDJSON or CSV. Each row answers exactly what `POST /v1/estimates/batch` answers for it.
 */

/** Rows in one job (the API contract's bound). */
export const MAX_JOB_ROWS = 100_000;
/** Largest uploaded file, bytes. */
export const MAX_JOB_FILE_BYTES = 64 * 1024 * 1024;
/** Longest job name. */
export const MAX_JOB_NAME_LENGTH = 120;

export const BATCH_JOB_STATUSES = ['queued', 'running', 'succeeded', 'stopped', 'cancelled', 'failed'] as const;
export type BatchJobStatusValue = (typeof BATCH_JOB_STATUSES)[number];
/** Statuses after which a job changes no more. */
export const TERMINAL_BATCH_STATUSES: readonly BatchJobStatusValue[] = ['succeeded', 'stopped', 'cancelled', 'failed'];
export const BATCH_STOP_REASONS = ['quota_exceeded', 'cancelled', 'error'] as const;
export const BATCH_SOURCES = ['csv', 'ndjson', 'json'] as const;

const EXAMPLE_JOB_ID = '3d1f7c2a-9b4e-4f60-8a2d-5c7e1b9f0a34';

export const batchJobNameSchema = nameText(MAX_JOB_NAME_LENGTH).meta({ description: 'A name for the job, shown in lists.', example: 'Alder Row, plots 1-24' });

export const batchJobItemSchema = z
  .strictObject({
    ref: batchRefSchema.optional(),
    request: z.unknown().meta({
      description: 'An estimate request as `POST /v1/estimates` takes it; an invalid one is that row’s own error, never a 400 for the job.',
      example: alderRowTownhouse,
    }),
  })
  .meta({ id: 'BatchJobItem', description: 'One stair of a job: your reference and its estimate request.' });

export const createBatchJobSchema = z
  .strictObject({
    name: batchJobNameSchema.optional(),
    items: z
      .array(batchJobItemSchema)
      .min(1)
      .max(MAX_JOB_ROWS)
      .meta({ description: `1 to ${MAX_JOB_ROWS} stairs (the JSON body is at most 4 MB; upload a file for more).` }),
  })
  .meta({
    id: 'CreateBatchJob',
    description: 'A job from JSON: the same items as `POST /v1/estimates/batch` takes.',
    example: { name: 'Alder Row, plots 14-15', items: [{ ref: 'Plot 14', request: alderRowTownhouse }, { ref: 'Plot 15', request: alderRowCornerUnit }] },
  });
export type CreateBatchJob = z.output<typeof createBatchJobSchema>;

export const createBatchJobQuerySchema = z
  .strictObject({
    detail: z.enum(BATCH_DETAILS).default('summary').meta({
      description: '`summary` (default): each result line holds the headline figures, failing checks and `bomTotal`; `full` adds the whole estimate as `result`.',
    }),
  })
  .meta({ id: 'CreateBatchJobQuery' });

export const BATCH_RESULT_FORMATS = ['ndjson', 'csv'] as const;
export const batchResultsQuerySchema = z
  .strictObject({
    format: z.enum(BATCH_RESULT_FORMATS).default('ndjson').meta({ description: '`ndjson` (default): one EstimateBatchItemResult per line; `csv`: one flat result row per stair.' }),
  })
  .meta({ id: 'BatchResultsQuery' });

export const batchJobParams = z.object({ id: z.string().meta({ description: 'The job’s id.', example: EXAMPLE_JOB_ID }) });

export const batchJobSchema = z
  .object({
    id: z.uuid(),
    name: z.string().nullable(),
    status: z.enum(BATCH_JOB_STATUSES).meta({
      description:
        '`queued`, `running`; then `succeeded` (every row answered, some may be errors), `stopped` (the monthly quota ran out; rows done are kept), ' +
        '`cancelled`, or `failed` (the job itself broke, not a row).',
    }),
    stopReason: z.enum(BATCH_STOP_REASONS).nullable(),
    source: z.enum(BATCH_SOURCES),
    detail: z.enum(BATCH_DETAILS),
    rows: z
      .object({
        total: z.int().min(0),
        done: z.int().min(0),
        ok: z.int().min(0).meta({ description: 'Rows sized (their designs may still fail checks).' }),
        failed: z.int().min(0).meta({ description: 'Rows answered with their own problem.' }),
        withFailingChecks: z.int().min(0).meta({ description: 'Sized rows with at least one failing check.' }),
      })
      .meta({ id: 'BatchJobRows' }),
    progress: z.number().min(0).max(1).meta({ description: 'Share of rows answered, 0 to 1.' }),
    rowsPerSecond: z.number().min(0).nullable().meta({ description: 'Rows answered per second since the job started; null before it starts.' }),
    etaSeconds: z.number().min(0).nullable().meta({ description: 'Seconds left at that rate while the job runs; null otherwise.' }),
    engineVersion: engineVersionSchema,
    catalogVersion: z.int().nullable().meta({ description: 'Version of the stored catalog that prices rows without an inline catalog; null when there is none.' }),
    createdBy: z.object({ type: z.enum(['user', 'key']), id: z.string() }).meta({ description: 'A user id, or an API key’s public key id.' }),
    createdAt: z.iso.datetime(),
    startedAt: z.iso.datetime().nullable(),
    finishedAt: z.iso.datetime().nullable(),
    expiresAt: z.iso.datetime().meta({ description: 'When the job and its results are deleted.' }),
    links: z.object({ self: z.string(), results: z.string(), errors: z.string() }),
  })
  .meta({
    id: 'Batch',
    description: 'A background batch job and its progress.',
    example: {
      id: EXAMPLE_JOB_ID,
      name: 'Alder Row, plots 1-400',
      status: 'running',
      stopReason: null,
      source: 'csv',
      detail: 'summary',
      rows: { total: 400, done: 120, ok: 118, failed: 2, withFailingChecks: 5 },
      progress: 0.3,
      rowsPerSecond: 850.2,
      etaSeconds: 0.3,
      engineVersion: '1.4.0',
      catalogVersion: 3,
      createdBy: { type: 'key', id: 'k7f3a9c2d1e0' },
      createdAt: '2026-12-02T09:00:00.000Z',
      startedAt: '2026-12-02T09:00:00.120Z',
      finishedAt: null,
      expiresAt: '2026-12-09T09:00:00.000Z',
      links: { self: `/v1/batches/${EXAMPLE_JOB_ID}`, results: `/v1/batches/${EXAMPLE_JOB_ID}/results`, errors: `/v1/batches/${EXAMPLE_JOB_ID}/errors` },
    },
  });
export type BatchJob = z.output<typeof batchJobSchema>;

export const batchJobPageSchema = z
  .object({
    items: z.array(batchJobSchema),
    nextCursor: z.string().nullable().meta({ description: 'Pass as `cursor` for the next page; `null` on the last page.' }),
  })
  .meta({ id: 'BatchPage' });
