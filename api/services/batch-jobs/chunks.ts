import { and, asc, eq, gte, inArray, isNull, lt, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { EstimateBatchItemResult } from '../../../shared/schemas/estimate-batch.js';
import type { Catalog } from '../../../shared/schemas/catalog.js';
import type { CheckedItem } from '../../../shared/sizing/batch/items.js';
import type { EstimateInput } from '../../../shared/schemas/estimate.js';
import type { ItemProblem } from '../../../shared/sizing/batch/items.js';
import type { Db } from '../../db/client.js';
import { batchJobRows, batchJobs } from '../../db/schema.js';
import { runBatch } from '../estimate-batch.js';
import type { QuotaService } from '../quotas.js';
import type { UsageMeter } from '../usage-meter.js';
import { RUNNABLE_STATUSES } from './store.js';
import type { BatchJobRow } from './view.js';

/** Rows sized per chunk: one transaction writes their answers and the job's counters. */
export const CHUNK_ROWS = 200;
/** Chunks in a row that may break on a fault of ours before the job is `failed`. */
export const MAX_FAULTS = 3;
/** Usage rows of batch job work carry this route: each chunk is one entry, its rows its units. */
export const JOB_USAGE_ROUTE = 'RUN /v1/batches/:id';

/** What a chunk did: more rows wait, the job is over (finished, cancelled, gone), or it stopped at the quota. */
export type ChunkOutcome = 'more' | 'over' | 'stopped';

/** A job that has just ended, so its creator can be told. */
export type Ended = Pick<BatchJobRow, 'id'>;

export interface ChunkDeps {
  db: Db;
  clock: () => Date;
  logger: Logger;
  quotas: QuotaService;
  usageMeter: UsageMeter;
  retention: (from: Date) => Date;
  ended: (job: Ended) => void;
}

/**
 * Sizes the next unanswered rows of a job (within [from, to) when given: a pg-boss chunk) and
 * writes them. Exactly once: an answer is written only where none is, in the transaction that
 * locks the job row and adds to its counters, and only while the job is still queued or running
 * (a cancel in between wins). The rows are metered as quota units first; when the quota has none
 * left the job stops (`stopped`, `quota_exceeded`) with the rows done kept.
 */
export async function runChunk(deps: ChunkDeps, jobId: string, range?: { from: number; to: number }): Promise<ChunkOutcome> {
  const { db, clock } = deps;
  const [job] = await db.select().from(batchJobs).where(eq(batchJobs.id, jobId));
  if (!job || !RUNNABLE_STATUSES.includes(job.status)) return 'over';

  const open = await db
    .select({ idx: batchJobRows.idx, ref: batchJobRows.ref, request: batchJobRows.request, problem: batchJobRows.problem })
    .from(batchJobRows)
    .where(
      and(
        eq(batchJobRows.jobId, jobId),
        isNull(batchJobRows.answer),
        range ? gte(batchJobRows.idx, range.from) : undefined,
        range ? lt(batchJobRows.idx, range.to) : undefined,
      ),
    )
    .orderBy(asc(batchJobRows.idx))
    .limit(CHUNK_ROWS);
  if (open.length === 0) {
    await finishIfDone(deps, jobId);
    return 'over';
  }

  // The quota first: all of the chunk, or what is left of it, or nothing (the job stops).
  let decision = await deps.quotas.admit(job.organizationId, clock(), open.length);
  let rows = open;
  if (!decision.admitted) {
    const left = decision.remaining;
    if (left > 0) {
      decision = await deps.quotas.admit(job.organizationId, clock(), left);
      rows = open.slice(0, left);
    }
    if (!decision.admitted) {
      await stopAtQuota(deps, jobId);
      return 'stopped';
    }
  }
  const ticket = decision.ticket;
  const started = performance.now();
  let written: EstimateBatchItemResult[] = [];
  try {
    if (job.status === 'queued') {
      await db.update(batchJobs).set({ status: 'running', startedAt: clock() }).where(and(eq(batchJobs.id, jobId), eq(batchJobs.status, 'queued')));
    }
    const items: CheckedItem[] = rows.map((r) =>
      r.problem ? { index: r.idx, ref: r.ref, problem: r.problem as unknown as ItemProblem } : { index: r.idx, ref: r.ref, input: r.request as unknown as EstimateInput },
    );
    // The catalog stored when the job was created prices every row: one version for the whole job.
    const snapshot = job.pricingCatalog && job.catalogVersion !== null ? { version: job.catalogVersion, catalog: job.pricingCatalog as unknown as Catalog } : null;
    const answers = await runBatch({ catalog: { pricingCatalog: async () => snapshot }, logger: deps.logger }, job.organizationId, items, job.detail);
    written = await writeAnswers(deps, jobId, answers);
  } finally {
    // Units for the rows this chunk answered: a row another instance answered first costs nothing here.
    if (written.length === ticket.units) ticket.settle();
    else {
      ticket.release();
      if (written.length > 0) {
        const again = await deps.quotas.admit(job.organizationId, clock(), written.length);
        if (again.admitted) again.ticket.settle();
      }
    }
    if (written.length > 0) {
      deps.usageMeter.record({
        organizationId: job.organizationId,
        keyId: job.meteredKeyId,
        apiKeyId: null,
        at: clock(),
        route: JOB_USAGE_ROUTE,
        status: 200,
        latencyMs: performance.now() - started,
        limited: false,
        units: written.length,
      });
    }
  }
  return (await finishIfDone(deps, jobId)) ? 'over' : 'more';
}

/** One transaction: lock the job, write answers where none is, add what was written to the counters. */
async function writeAnswers(deps: ChunkDeps, jobId: string, answers: EstimateBatchItemResult[]): Promise<EstimateBatchItemResult[]> {
  const now = deps.clock();
  return deps.db.transaction(async (tx) => {
    const [locked] = await tx.select({ status: batchJobs.status }).from(batchJobs).where(eq(batchJobs.id, jobId)).for('update');
    if (!locked || !RUNNABLE_STATUSES.includes(locked.status)) return [];
    const payload = JSON.stringify(answers.map((a) => ({ idx: a.index, answer: a, status: a.status })));
    const result = await tx.execute(sql`
      update ${batchJobRows} as r set answer = v.answer, status = v.status, answered_at = ${now.toISOString()}::timestamptz
      from jsonb_to_recordset(${payload}::jsonb) as v(idx int, answer jsonb, status text)
      where r.job_id = ${jobId}::uuid and r.idx = v.idx and r.answer is null
      returning r.idx`);
    const done = new Set((result as unknown as { rows: { idx: number }[] }).rows.map((r) => Number(r.idx)));
    const written = answers.filter((a) => done.has(a.index));
    if (written.length === 0) return written;
    const ok = written.filter((a) => a.status === 'ok');
    const failing = ok.filter((a) => a.status === 'ok' && a.failingChecks.length > 0).length;
    await tx
      .update(batchJobs)
      .set({
        status: 'running',
        rowsDone: sql`${batchJobs.rowsDone} + ${written.length}`,
        rowsOk: sql`${batchJobs.rowsOk} + ${ok.length}`,
        rowsFailed: sql`${batchJobs.rowsFailed} + ${written.length - ok.length}`,
        rowsWithFailingChecks: sql`${batchJobs.rowsWithFailingChecks} + ${failing}`,
        heartbeatAt: now,
        faults: 0,
      })
      .where(eq(batchJobs.id, jobId));
    return written;
  });
}

/** Marks the job succeeded once every row is answered; true when it is over (by this call or before). */
async function finishIfDone(deps: ChunkDeps, jobId: string): Promise<boolean> {
  const now = deps.clock();
  const [finished] = await deps.db
    .update(batchJobs)
    .set({ status: 'succeeded', finishedAt: now, expiresAt: deps.retention(now), leaseOwner: null, leaseUntil: null })
    .where(and(eq(batchJobs.id, jobId), inArray(batchJobs.status, RUNNABLE_STATUSES), sql`${batchJobs.rowsDone} >= ${batchJobs.rowsTotal}`))
    .returning({ id: batchJobs.id });
  if (finished) {
    deps.ended(finished);
    return true;
  }
  const [job] = await deps.db.select({ status: batchJobs.status }).from(batchJobs).where(eq(batchJobs.id, jobId));
  return !job || !RUNNABLE_STATUSES.includes(job.status);
}

async function stopAtQuota(deps: ChunkDeps, jobId: string): Promise<void> {
  const now = deps.clock();
  const [stopped] = await deps.db
    .update(batchJobs)
    .set({ status: 'stopped', stopReason: 'quota_exceeded', finishedAt: now, expiresAt: deps.retention(now), leaseOwner: null, leaseUntil: null })
    .where(and(eq(batchJobs.id, jobId), inArray(batchJobs.status, RUNNABLE_STATUSES)))
    .returning({ id: batchJobs.id });
  if (stopped) deps.ended(stopped);
}

/** A chunk broke on a fault of ours: counted; after MAX_FAULTS in a row the job fails. */
export async function recordFault(deps: ChunkDeps, jobId: string): Promise<void> {
  const now = deps.clock();
  const [job] = await deps.db
    .update(batchJobs)
    .set({ faults: sql`${batchJobs.faults} + 1` })
    .where(and(eq(batchJobs.id, jobId), inArray(batchJobs.status, RUNNABLE_STATUSES)))
    .returning({ faults: batchJobs.faults });
  if (!job || job.faults < MAX_FAULTS) return;
  const [failed] = await deps.db
    .update(batchJobs)
    .set({ status: 'failed', stopReason: 'error', finishedAt: now, expiresAt: deps.retention(now), leaseOwner: null, leaseUntil: null })
    .where(and(eq(batchJobs.id, jobId), inArray(batchJobs.status, RUNNABLE_STATUSES)))
    .returning({ id: batchJobs.id });
  if (failed) deps.ended(failed);
}
