import type { BatchJob } from '../../../shared/schemas/batch-jobs.js';
import { TERMINAL_BATCH_STATUSES } from '../../../shared/schemas/batch-jobs.js';
import type { batchJobs } from '../../db/schema.js';

export type BatchJobRow = typeof batchJobs.$inferSelect;

export const batchLink = (id: string) => `/v1/batches/${id}`;

const round1 = (n: number) => Math.round(n * 10) / 10;

/** The job as the API shows it; rate and ETA from its start and the rows done (`now` on the injected clock). */
export function batchJobView(row: BatchJobRow, now: Date): BatchJob {
  const status = row.status === 'receiving' ? 'queued' : row.status;
  const terminal = TERMINAL_BATCH_STATUSES.includes(status);
  let rowsPerSecond: number | null = null;
  if (row.startedAt && row.rowsDone > 0) {
    const seconds = ((row.finishedAt ?? now).getTime() - row.startedAt.getTime()) / 1000;
    rowsPerSecond = seconds > 0 ? round1(row.rowsDone / seconds) : null;
  }
  const left = row.rowsTotal - row.rowsDone;
  const etaSeconds = !terminal && rowsPerSecond ? round1(left / rowsPerSecond) : null;
  return {
    id: row.id,
    name: row.name,
    status,
    stopReason: row.stopReason,
    source: row.source,
    detail: row.detail,
    rows: { total: row.rowsTotal, done: row.rowsDone, ok: row.rowsOk, failed: row.rowsFailed, withFailingChecks: row.rowsWithFailingChecks },
    progress: row.rowsTotal > 0 ? Math.min(1, row.rowsDone / row.rowsTotal) : 0,
    rowsPerSecond,
    etaSeconds,
    engineVersion: row.engineVersion,
    catalogVersion: row.catalogVersion,
    createdBy: { type: row.createdByType, id: row.createdById },
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
    expiresAt: row.expiresAt.toISOString(),
    links: { self: batchLink(row.id), results: `${batchLink(row.id)}/results`, errors: `${batchLink(row.id)}/errors` },
  };
}
