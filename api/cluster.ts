import cluster, { type Worker } from 'node:cluster';
import type { Logger } from 'pino';
import type { Config } from './config.js';
import { serveClusterMetrics } from './metrics/cluster-metrics.js';

/**
 * WEB_CONCURRENCY=N: N worker processes share one port through node:cluster (the primary accepts
 * and hands connections round-robin). Workers are stateless: PostgreSQL holds the data and the
 * monthly tallies, Redis the rate-limit counters, LISTEN/NOTIFY carries key revocations. The
 * primary only forks, restarts a worker that dies, relays SIGTERM and gathers /metrics.
 */

/** Why the configuration runs one process, or null when it runs `webConcurrency` workers. */
export function singleProcessReason(config: Config): string | null {
  if (config.webConcurrency <= 1) return null;
  if (!config.databaseUrl) {
    return `WEB_CONCURRENCY=${config.webConcurrency} ignored: the embedded database (PGlite) belongs to one process, so one process serves. Set DATABASE_URL (and REDIS_URL) to run workers.`;
  }
  return null;
}

/** A worker that dies within this long after its start is crashing on start: stop forking it. */
const CRASH_ON_START_MS = 5_000;
const RESTART_DELAY_MS = 1_000;

/** Runs the primary: forks the workers and keeps them running until SIGTERM/SIGINT. */
export function runPrimary(config: Config, logger: Logger): void {
  serveClusterMetrics();
  let stopping = false;
  const startedAt = new Map<number, number>();
  const fork = () => {
    const worker = cluster.fork();
    startedAt.set(worker.id, Date.now());
  };
  for (let i = 0; i < config.webConcurrency; i++) fork();
  logger.info({ workers: config.webConcurrency }, 'primary started its workers');

  cluster.on('exit', (worker: Worker, code, signal) => {
    const lived = Date.now() - (startedAt.get(worker.id) ?? 0);
    startedAt.delete(worker.id);
    if (stopping) {
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
      return;
    }
    if (lived < CRASH_ON_START_MS && code !== 0) {
      logger.fatal({ worker: worker.id, code, signal }, 'a worker failed on start; stopping');
      stopping = true;
      for (const w of Object.values(cluster.workers ?? {})) w?.kill('SIGTERM');
      process.exitCode = 1;
      if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(1);
      return;
    }
    logger.error({ worker: worker.id, code, signal }, 'a worker stopped; starting another');
    setTimeout(fork, RESTART_DELAY_MS).unref();
  });

  const shutdown = (signal: NodeJS.Signals) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'stopping the workers');
    // Each worker drains its answers under way (SHUTDOWN_DRAIN_MS) and writes its buffered usage.
    for (const w of Object.values(cluster.workers ?? {})) w?.kill('SIGTERM');
    if (Object.keys(cluster.workers ?? {}).length === 0) process.exit(0);
  };
  process.on('SIGTERM', () => shutdown('SIGTERM'));
  process.on('SIGINT', () => shutdown('SIGINT'));
}
