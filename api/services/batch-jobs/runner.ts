import { randomUUID } from 'node:crypto';
import { and, asc, eq, inArray, isNull, lt, or, sql } from 'drizzle-orm';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Database } from '../../db/client.js';
import { batchJobRows, batchJobs } from '../../db/schema.js';
import type { CatalogService } from '../catalog.js';
import type { Mailer } from '../mailer.js';
import type { QuotaService } from '../quotas.js';
import type { UsageMeter } from '../usage-meter.js';
import { CHUNK_ROWS, recordFault, runChunk, type ChunkDeps, type ChunkOutcome } from './chunks.js';
import type { IntakeRow } from './intake.js';
import { notifyEnded } from './mail.js';
import { createBatchJobStore, RUNNABLE_STATUSES, type NewJob } from './store.js';
import { batchJobView } from './view.js';

/** How often an idle in-process runner looks for work it was not woken for. */
const POLL_MS = 1_000;
/** How often expired jobs are deleted. */
const SWEEP_MS = 10 * 60 * 1000;
/** A pg-boss job (one chunk) not done in this long is handed to another worker; the row guard makes that safe. */
const CHUNK_EXPIRE_S = 120;
/** On PostgreSQL, a job with unanswered rows and no progress for this long gets its chunks sent again. */
const STALLED_MS = 5 * 60 * 1000;
const QUEUE = 'batch-chunk';

interface ChunkMessage {
  jobId: string;
  from: number;
  to: number;
}

export interface BatchJobDeps {
  database: Database;
  clock: () => Date;
  logger: Logger;
  quotas: QuotaService;
  usageMeter: UsageMeter;
  mailer: Mailer;
  catalog: Pick<CatalogService, 'pricingCatalog'>;
  publicUrl: string;
  retentionDays: number;
  /** Rows a job may hold (MAX_JOB_ROWS; tests set fewer). */
  maxRows?: number;
}

/** pg-boss speaks through our own pool, so it shares the configured server and schema search path. */
function bossDb(database: Database): PgBoss.Db {
  const pool = (database.db as unknown as { $client: { query(text: string, values?: unknown[]): Promise<{ rows: unknown[] }> } }).$client;
  return { executeSql: (text, values) => pool.query(text, values) } as PgBoss.Db;
}

/**
 * Batch jobs: the store, and the runner that sizes their rows in the background.
 *
 * - PGlite (one process per DATA_DIR): an in-process loop takes one chunk of each runnable job in
 *   turn, yielding to the event loop between chunks; on start it takes up every job left queued or
 *   running, so a crash or restart resumes where the rows stopped.
 * - PostgreSQL (several instances): each chunk of rows is a pg-boss job, so every instance's
 *   worker takes chunks of the same job; a chunk whose worker died is retried after it expires.
 *
 * Either way a row is answered exactly once: answers are written only where none is, in the
 * transaction that updates the job's counters (see chunks.ts).
 */
export function createBatchJobService(deps: BatchJobDeps) {
  const { database, clock, logger } = deps;
  const { db } = database;
  const store = createBatchJobStore({ db, clock, retentionDays: deps.retentionDays, maxRows: deps.maxRows });
  const instance = randomUUID();
  const mailing = new Set<Promise<void>>();

  const ended = (job: { id: string }) => {
    const work = notifyEnded({ db, mailer: deps.mailer, clock, publicUrl: deps.publicUrl }, job.id)
      .catch((err) => logger.error({ err, jobId: job.id }, 'batch job e-mail not sent'))
      .finally(() => mailing.delete(work));
    mailing.add(work);
  };
  const chunkDeps: ChunkDeps = { db, clock, logger, quotas: deps.quotas, usageMeter: deps.usageMeter, retention: store.retention, ended };

  /** A chunk, with a fault of ours counted against the job instead of thrown. */
  const chunk = async (jobId: string, range?: { from: number; to: number }): Promise<ChunkOutcome | 'fault'> => {
    try {
      return await runChunk(chunkDeps, jobId, range);
    } catch (err) {
      logger.error({ err, jobId }, 'batch job chunk failed');
      await recordFault(chunkDeps, jobId).catch((e) => logger.error({ err: e, jobId }, 'batch job fault not recorded'));
      return 'fault';
    }
  };

  let boss: PgBoss | null = null;
  /** Set by start(): before it (tests driving drain() themselves) nothing runs in the background. */
  let started = false;
  let stopping = false;
  let running: Promise<void> | null = null;
  let again = false;
  let pollTimer: NodeJS.Timeout | undefined;
  let sweepTimer: NodeJS.Timeout | undefined;

  const yieldToLoop = () => new Promise<void>((resolve) => setImmediate(resolve));

  /**
   * Sizes every runnable job to its end (in process), one chunk of each job in turn, oldest job
   * first, so a large job does not hold up a small one. Returns when nothing is left or every
   * job still runnable broke on a fault this round (the poll tries again).
   */
  const drain = async (): Promise<void> => {
    for (;;) {
      if (stopping) return;
      const jobs = await db
        .select({ id: batchJobs.id })
        .from(batchJobs)
        .where(inArray(batchJobs.status, RUNNABLE_STATUSES))
        .orderBy(asc(batchJobs.createdAt), asc(batchJobs.id))
        .limit(20);
      if (jobs.length === 0) return;
      let progressed = false;
      for (const job of jobs) {
        if (stopping) return;
        const leaseUntil = new Date(clock().getTime() + 60_000);
        await db.update(batchJobs).set({ leaseOwner: instance, leaseUntil }).where(eq(batchJobs.id, job.id));
        const outcome = await chunk(job.id);
        if (outcome !== 'fault') progressed = true;
        await yieldToLoop();
      }
      if (!progressed) return;
    }
  };

  /** Runs drain() unless it runs already (then once more after it). */
  const kick = () => {
    if (!started || stopping || boss) return;
    if (running) {
      again = true;
      return;
    }
    running = drain()
      .catch((err) => logger.error({ err }, 'batch job runner failed'))
      .finally(() => {
        running = null;
        if (again) {
          again = false;
          kick();
        }
      });
  };

  /** pg-boss: one message per chunk of rows still unanswered. */
  const enqueue = async (jobId: string) => {
    if (!boss) return kick();
    // The divisor is a constant of ours, written into the statement so GROUP BY sees one expression.
    const chunkOf = sql<number>`${batchJobRows.idx} / ${sql.raw(String(CHUNK_ROWS))}`.mapWith(Number);
    const open = await db
      .selectDistinct({ chunk: chunkOf })
      .from(batchJobRows)
      .where(and(eq(batchJobRows.jobId, jobId), isNull(batchJobRows.answer)))
      .orderBy(chunkOf);
    const messages = open.map(({ chunk: n }) => ({
      name: QUEUE,
      data: { jobId, from: n * CHUNK_ROWS, to: (n + 1) * CHUNK_ROWS } satisfies ChunkMessage,
      expireInSeconds: CHUNK_EXPIRE_S,
      retryLimit: 10,
      retryDelay: 2,
    }));
    for (let i = 0; i < messages.length; i += 1000) await boss.insert(messages.slice(i, i + 1000));
  };

  /** PostgreSQL: jobs that made no progress for a while (their messages lost in a crash) are sent again. */
  const resendStalled = async () => {
    if (!boss) return;
    const cutoff = new Date(clock().getTime() - STALLED_MS);
    const stalled = await db
      .select({ id: batchJobs.id })
      .from(batchJobs)
      .where(and(inArray(batchJobs.status, RUNNABLE_STATUSES), or(lt(batchJobs.heartbeatAt, cutoff), and(isNull(batchJobs.heartbeatAt), lt(batchJobs.createdAt, cutoff)))));
    for (const job of stalled) {
      await db.update(batchJobs).set({ heartbeatAt: clock() }).where(eq(batchJobs.id, job.id));
      await enqueue(job.id);
    }
  };

  /** A job that ended just before a crash may not have sent its e-mail: send it now. */
  const notifyMissed = async () => {
    const cutoff = new Date(clock().getTime() - 60_000);
    const missed = await db
      .select({ id: batchJobs.id })
      .from(batchJobs)
      .where(and(inArray(batchJobs.status, ['succeeded', 'stopped', 'failed']), isNull(batchJobs.notifiedAt), lt(batchJobs.finishedAt, cutoff)));
    for (const job of missed) ended(job);
  };

  const sweep = async () => {
    const deleted = await store.sweep();
    if (deleted) logger.info({ deleted }, 'expired batch jobs deleted');
    await notifyMissed();
    await resendStalled();
  };

  return {
    ...store,

    /** Creates a job from checked rows (read as they come) and hands it to the runner. */
    async create(job: NewJob, rows: AsyncIterable<IntakeRow> | Iterable<IntakeRow>) {
      // Stored with the job: one catalog version prices every row, whichever instance sizes it.
      const pricing = await deps.catalog.pricingCatalog(job.organizationId);
      const created = await store.create(job, pricing, rows);
      await enqueue(created.id).catch((err) => logger.error({ err, jobId: created.id }, 'batch job not enqueued; the stalled-job sweep sends it again'));
      return batchJobView(created, clock());
    },

    /** Sizes everything runnable now, in this process (tests, and the PGlite runner's loop). */
    drain,

    sweep,

    /**
     * Starts the background runner: pg-boss on PostgreSQL, the in-process loop on PGlite (which
     * first takes up every job a previous process left queued or running).
     */
    async start(): Promise<void> {
      started = true;
      if (database.kind === 'postgres') {
        const schema = database.schemaName === 'public' ? 'pgboss' : `${database.schemaName}_pgboss`;
        boss = new PgBoss({ db: bossDb(database), schema, supervise: true, schedule: false });
        boss.on('error', (err) => logger.error({ err }, 'pg-boss error'));
        await boss.start();
        if (!(await boss.getQueue(QUEUE))) {
          await boss.createQueue(QUEUE, { name: QUEUE, policy: 'standard' }).catch(async (err) => {
            if (!(await boss!.getQueue(QUEUE))) throw err; // another instance created it meanwhile: fine
          });
        }
        await boss.work<ChunkMessage>(QUEUE, { batchSize: 1, pollingIntervalSeconds: 0.5 }, async ([message]) => {
          if (stopping) throw new Error('stopping: the chunk goes back to the queue');
          const outcome = await chunk(message.data.jobId, { from: message.data.from, to: message.data.to });
          if (outcome === 'fault') throw new Error('batch chunk fault: pg-boss retries it');
        });
      } else {
        // One process owns a PGlite DATA_DIR: leases left by a killed one are void.
        await db.update(batchJobs).set({ leaseOwner: null, leaseUntil: null }).where(inArray(batchJobs.status, RUNNABLE_STATUSES));
        pollTimer = setInterval(kick, POLL_MS);
        pollTimer.unref();
        kick();
      }
      sweepTimer = setInterval(() => void sweep().catch((err) => logger.error({ err }, 'batch job sweep failed')), SWEEP_MS);
      sweepTimer.unref();
      void sweep().catch((err) => logger.error({ err }, 'batch job sweep failed'));
    },

    /** Workers on this instance (tests): true when pg-boss runs the chunks. */
    get distributed() {
      return boss !== null;
    },

    /** Stops taking chunks, lets the one under way finish and waits for pending e-mails. */
    async close(): Promise<void> {
      stopping = true;
      clearInterval(pollTimer);
      clearInterval(sweepTimer);
      await running;
      if (boss) await boss.stop({ graceful: true, wait: true, timeout: 10_000, close: false });
      while (mailing.size > 0) await Promise.all([...mailing]);
    },

    /** Resolves when every job-ended e-mail started so far has been sent (or has failed). */
    async mailed(): Promise<void> {
      while (mailing.size > 0) await Promise.all([...mailing]);
    },
  };
}

export type BatchJobService = ReturnType<typeof createBatchJobService>;
