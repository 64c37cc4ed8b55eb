import { and, asc, desc, eq, gt, inArray, isNotNull, lt, or, sql } from 'drizzle-orm';
import type { BatchJob } from '../../../shared/schemas/batch-jobs.js';
import { MAX_JOB_ROWS } from '../../../shared/schemas/batch-jobs.js';
import type { BatchDetail, EstimateBatchItemResult } from '../../../shared/schemas/estimate-batch.js';
import { ENGINE_VERSION } from '../../../shared/sizing/version.js';
import type { Db } from '../../db/client.js';
import { batchJobRows, batchJobs, type BatchJobStatus } from '../../db/schema.js';
import { HttpProblem } from '../../problem.js';
import type { PricingCatalog } from '../catalog.js';
import { decodeCursor, toPage, type Page, type PageQuery } from '../pagination.js';
import { afterCursor, isUuid, newestFirstCursor } from '../projects.js';
import type { IntakeRow } from './intake.js';
import { batchJobView, type BatchJobRow } from './view.js';

/** Rows inserted per statement while a file is read: the file is never held whole. */
const INSERT_ROWS = 500;
/** Answers read per query while results stream out. */
export const RESULT_PAGE_ROWS = 500;
const DAY_MS = 24 * 60 * 60 * 1000;

export const RUNNABLE_STATUSES: BatchJobStatus[] = ['queued', 'running'];

export const batchNotFound = (id: string) => new HttpProblem(404, 'batch_not_found', 'Not found', `No batch job ${id} in this organisation.`);

export interface NewJob {
  organizationId: string;
  name: string | null;
  source: 'csv' | 'ndjson' | 'json';
  detail: BatchDetail;
  createdBy: { type: 'user' | 'key'; id: string };
  meteredKeyId: string;
}

/** Jobs and their rows in the database; every read filters by organisation (another one's job is a 404). */
export function createBatchJobStore({ db, clock, retentionDays, maxRows = MAX_JOB_ROWS }: { db: Db; clock: () => Date; retentionDays: number; maxRows?: number }) {
  const retention = (from: Date) => new Date(from.getTime() + retentionDays * DAY_MS);

  async function row(organizationId: string, id: string): Promise<BatchJobRow> {
    if (!isUuid(id)) throw batchNotFound(id);
    const [found] = await db.select().from(batchJobs).where(and(eq(batchJobs.organizationId, organizationId), eq(batchJobs.id, id)));
    if (!found || found.status === 'receiving') throw batchNotFound(id);
    return found;
  }

  return {
    retention,
    row,

    /**
     * Creates the job and inserts its rows as they are read, in statements of INSERT_ROWS. The job
     * is `receiving` (invisible) until the last row is in; a failure deletes it with its rows.
     */
    async create(job: NewJob, pricing: PricingCatalog | null, rows: AsyncIterable<IntakeRow> | Iterable<IntakeRow>): Promise<BatchJobRow> {
      const now = clock();
      const [created] = await db
        .insert(batchJobs)
        .values({
          organizationId: job.organizationId,
          name: job.name,
          status: 'receiving',
          source: job.source,
          detail: job.detail,
          createdByType: job.createdBy.type,
          createdById: job.createdBy.id,
          meteredKeyId: job.meteredKeyId,
          engineVersion: ENGINE_VERSION,
          catalogVersion: pricing?.version ?? null,
          pricingCatalog: (pricing?.catalog as unknown as Record<string, unknown>) ?? null,
          createdAt: now,
          expiresAt: retention(now),
        })
        .returning();
      try {
        let buffer: (typeof batchJobRows.$inferInsert)[] = [];
        let total = 0;
        const write = async () => {
          if (buffer.length) await db.insert(batchJobRows).values(buffer);
          buffer = [];
        };
        for await (const item of rows) {
          if (++total > maxRows) {
            throw new HttpProblem(413, 'too_many_rows', 'Too many rows', `A batch job takes at most ${maxRows} rows; split the file.`);
          }
          buffer.push({
            jobId: created.id,
            idx: item.index,
            ref: item.ref,
            request: 'input' in item ? (item.input as unknown as Record<string, unknown>) : null,
            problem: 'problem' in item ? (item.problem as unknown as Record<string, unknown>) : null,
          });
          if (buffer.length >= INSERT_ROWS) await write();
        }
        await write();
        if (total === 0) {
          throw new HttpProblem(400, 'validation_failed', 'No rows', 'The input holds no stairs.', { errors: [{ path: 'file', message: 'no rows' }] });
        }
        const [queued] = await db.update(batchJobs).set({ status: 'queued', rowsTotal: total }).where(eq(batchJobs.id, created.id)).returning();
        return queued;
      } catch (err) {
        await db.delete(batchJobs).where(eq(batchJobs.id, created.id));
        throw err;
      }
    },

    async get(organizationId: string, id: string): Promise<BatchJob> {
      return batchJobView(await row(organizationId, id), clock());
    },

    async list(organizationId: string, page: PageQuery): Promise<Page<BatchJob>> {
      const cursor = decodeCursor(page.cursor, newestFirstCursor);
      const rows = await db
        .select()
        .from(batchJobs)
        .where(and(eq(batchJobs.organizationId, organizationId), inArray(batchJobs.status, ['queued', 'running', 'succeeded', 'stopped', 'cancelled', 'failed']), afterCursor(batchJobs.createdAt, batchJobs.id, cursor)))
        .orderBy(desc(batchJobs.createdAt), desc(batchJobs.id))
        .limit(page.limit + 1);
      const now = clock();
      return toPage(rows, page.limit, (r) => batchJobView(r, now), (r) => [r.createdAt.toISOString(), r.id]);
    },

    /** Cancels a job that has not finished: no row is answered after this (the runner checks in the same transaction). */
    async cancel(organizationId: string, id: string): Promise<BatchJob> {
      const existing = await row(organizationId, id);
      const now = clock();
      const [cancelled] = await db
        .update(batchJobs)
        .set({ status: 'cancelled', stopReason: 'cancelled', finishedAt: now, expiresAt: retention(now) })
        .where(and(eq(batchJobs.id, existing.id), inArray(batchJobs.status, RUNNABLE_STATUSES)))
        .returning();
      if (!cancelled) throw new HttpProblem(409, 'batch_finished', 'Job finished', `The batch job is ${existing.status === 'receiving' ? 'queued' : existing.status}; only a queued or running job can be cancelled.`);
      return batchJobView(cancelled, now);
    },

    /** Answers in row order, RESULT_PAGE_ROWS at a time (never all of them in memory); only errors when asked. */
    async *answers(jobId: string, onlyErrors: boolean): AsyncGenerator<EstimateBatchItemResult[]> {
      let after = -1;
      for (;;) {
        const page = await db
          .select({ idx: batchJobRows.idx, answer: batchJobRows.answer })
          .from(batchJobRows)
          .where(and(eq(batchJobRows.jobId, jobId), gt(batchJobRows.idx, after), isNotNull(batchJobRows.answer), onlyErrors ? eq(batchJobRows.status, 'error') : undefined))
          .orderBy(asc(batchJobRows.idx))
          .limit(RESULT_PAGE_ROWS);
        if (page.length === 0) return;
        after = page[page.length - 1].idx;
        yield page.map((r) => r.answer as unknown as EstimateBatchItemResult);
        if (page.length < RESULT_PAGE_ROWS) return;
      }
    },

    /** Jobs and their rows by status, for the metrics (uploads still being read are left out). */
    async progress(): Promise<{ status: string; jobs: number; rowsTotal: number; rowsDone: number }[]> {
      const rows = await db
        .select({
          status: batchJobs.status,
          jobs: sql<string>`count(*)`,
          rowsTotal: sql<string>`coalesce(sum(${batchJobs.rowsTotal}), 0)`,
          rowsDone: sql<string>`coalesce(sum(${batchJobs.rowsDone}), 0)`,
        })
        .from(batchJobs)
        .where(inArray(batchJobs.status, ['queued', 'running', 'succeeded', 'stopped', 'cancelled', 'failed']))
        .groupBy(batchJobs.status);
      // count and sum come back as text from PostgreSQL (bigint / numeric).
      return rows.map((r) => ({ status: r.status, jobs: Number(r.jobs), rowsTotal: Number(r.rowsTotal), rowsDone: Number(r.rowsDone) }));
    },

    /** Deletes expired jobs with their rows, and uploads abandoned mid-way (a crash while reading a file). */
    async sweep(): Promise<number> {
      const now = clock();
      const abandoned = new Date(now.getTime() - DAY_MS);
      const gone = await db
        .delete(batchJobs)
        .where(or(lt(batchJobs.expiresAt, now), and(eq(batchJobs.status, 'receiving'), lt(batchJobs.createdAt, abandoned))))
        .returning({ id: batchJobs.id });
      return gone.length;
    },
  };
}

export type BatchJobStore = ReturnType<typeof createBatchJobStore>;
