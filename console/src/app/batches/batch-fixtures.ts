import type { Batch } from '../core/api-types.js';

const ID = '3d1f7c2a-9b4e-4f60-8a2d-5c7e1b9f0a34';

/** Test support: a job of the invented Alder Row development (demo-scenario.md), running by default. */
export function alderRowJob(overrides: Partial<Batch> = {}): Batch {
  const id = overrides.id ?? ID;
  return {
    id,
    name: 'Alder Row, plots 1-24',
    status: 'running',
    stopReason: null,
    source: 'csv',
    detail: 'summary',
    rows: { total: 24, done: 6, ok: 5, failed: 1, withFailingChecks: 2 },
    progress: 0.25,
    rowsPerSecond: 3,
    etaSeconds: 6,
    engineVersion: '0.1.0',
    catalogVersion: 3,
    createdBy: { type: 'user', id: '1f6d4c2a-8b3e-4f71-9a0c-5e2b7d9c1a34' },
    createdAt: '2026-12-02T09:00:00.000Z',
    startedAt: '2026-12-02T09:00:01.000Z',
    finishedAt: null,
    expiresAt: '2026-12-09T09:00:00.000Z',
    links: { self: `/v1/batches/${id}`, results: `/v1/batches/${id}/results`, errors: `/v1/batches/${id}/errors` },
    ...overrides,
  };
}

/** The same job once every row is answered. */
export function alderRowJobDone(overrides: Partial<Batch> = {}): Batch {
  return alderRowJob({
    status: 'succeeded',
    rows: { total: 24, done: 24, ok: 22, failed: 2, withFailingChecks: 3 },
    progress: 1,
    etaSeconds: null,
    finishedAt: '2026-12-02T09:00:09.000Z',
    ...overrides,
  });
}
