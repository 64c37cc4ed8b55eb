import type { Batch, BatchStatus } from '../core/api-types.js';

/**
 * Statuses after which a job changes no more. Kept here rather than imported from shared/schemas,
 * which would pull zod into this screen's chunk; the spec holds the two lists equal.
 */
export const FINAL_STATUSES: readonly BatchStatus[] = ['succeeded', 'stopped', 'cancelled', 'failed'];

/** Longest job name the API takes (shared/schemas/batch-jobs.ts MAX_JOB_NAME_LENGTH; the spec checks). */
export const JOB_NAME_MAX = 120;

export function isFinal(status: BatchStatus): boolean {
  return FINAL_STATUSES.includes(status);
}

/** The chip's word for a status, and why a job ended early. */
export function statusText(batch: Pick<Batch, 'status' | 'stopReason'>): string {
  switch (batch.status) {
    case 'queued':
      return 'Queued';
    case 'running':
      return 'Running';
    case 'succeeded':
      return 'Finished';
    case 'stopped':
      return batch.stopReason === 'quota_exceeded' ? 'Stopped: quota used up' : 'Stopped';
    case 'cancelled':
      return 'Cancelled';
    case 'failed':
      return 'Failed';
  }
}

/** What a person calls a job: its name, else the start of its id. */
export function jobLabel(batch: Pick<Batch, 'id' | 'name'>): string {
  return batch.name ?? `Job ${batch.id.slice(0, 8)}`;
}

/** `1 h 4 min`, `3 min 20 s`, `45 s`; a dash when the API gives no estimate. */
export function formatEta(seconds: number | null): string {
  if (seconds === null || !Number.isFinite(seconds)) return '—';
  const s = Math.max(0, Math.round(seconds));
  if (s < 60) return `${s} s`;
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  if (h > 0) return m > 0 ? `${h} h ${m} min` : `${h} h`;
  const rest = s % 60;
  return rest > 0 ? `${m} min ${rest} s` : `${m} min`;
}

/** Rows per second with sensible precision: `0.4`, `12`, `1,250`. */
export function formatRate(rowsPerSecond: number | null): string {
  if (rowsPerSecond === null || !Number.isFinite(rowsPerSecond)) return '—';
  const digits = rowsPerSecond < 10 ? 1 : 0;
  return `${rowsPerSecond.toLocaleString('en', { maximumFractionDigits: digits })} rows/s`;
}
