import { Counter, Gauge, Histogram, Registry, collectDefaultMetrics, type OpenMetricsContentType } from 'prom-client';

/**
 * What the platform exposes at GET /metrics (OpenMetrics text, prom-client). Every app gets its own
 * registry (tests build many apps in one process); process metrics (CPU, memory, event-loop lag,
 * GC) live in one registry per process, collected once.
 */

type OpenMetricsRegistry = Registry<OpenMetricsContentType>;
let processRegistry: OpenMetricsRegistry | undefined;

/** A registry that writes the OpenMetrics text format. */
export function openMetricsRegistry(): OpenMetricsRegistry {
  const registry = new Registry<OpenMetricsContentType>();
  registry.setContentType(Registry.OPENMETRICS_CONTENT_TYPE);
  return registry;
}

/** The process-wide registry of Node's own metrics, created on first use. */
export function processMetrics(): OpenMetricsRegistry {
  if (!processRegistry) {
    processRegistry = openMetricsRegistry();
    collectDefaultMetrics({ register: processRegistry, prefix: 'treadwise_' });
  }
  return processRegistry;
}

/** Latency buckets, seconds: sub-millisecond sizing calls up to a slow PDF render. */
const HTTP_BUCKETS = [0.0005, 0.001, 0.0025, 0.005, 0.01, 0.025, 0.05, 0.1, 0.25, 0.5, 1, 2.5, 5, 10];
/** The engine alone: a voltage drop takes microseconds, a 60-tread estimate a few milliseconds. */
const ENGINE_BUCKETS = [0.00001, 0.000025, 0.00005, 0.0001, 0.00025, 0.0005, 0.001, 0.0025, 0.005, 0.01, 0.05, 0.25, 1];

export function createMetrics() {
  const registry = openMetricsRegistry();
  const httpRequests = new Counter({
    name: 'treadwise_http_requests_total',
    help: 'Requests answered, by route pattern (as in the policy table), method and status code.',
    labelNames: ['route', 'status'] as const,
    registers: [registry],
  });
  const httpDuration = new Histogram({
    name: 'treadwise_http_request_duration_seconds',
    help: 'Time from the request reaching the app to the last byte of the answer, by route pattern and status class.',
    labelNames: ['route', 'status_class'] as const,
    buckets: HTTP_BUCKETS,
    registers: [registry],
  });
  const engineDuration = new Histogram({
    name: 'treadwise_engine_duration_seconds',
    help: 'Time spent in the sizing engine per call, by operation (the last segment of the calculation route, or estimate).',
    labelNames: ['operation'] as const,
    buckets: ENGINE_BUCKETS,
    registers: [registry],
  });
  const refusals = new Counter({
    name: 'treadwise_limit_refusals_total',
    help: 'Calls refused by a limit: rate_limited, quota_exceeded or cost_budget_exceeded.',
    labelNames: ['reason'] as const,
    registers: [registry],
  });
  const quotaUnits = new Counter({
    name: 'treadwise_quota_units_total',
    help: 'Monthly-quota units used by answered calls (one per call, one per item of a batch).',
    registers: [registry],
  });

  /**
   * Batch jobs as the database holds them, read at each scrape. Every instance reads the same
   * rows, so under WEB_CONCURRENCY the primary keeps one worker's figure (`max`), never the sum.
   */
  const batchSource: { read?: () => Promise<BatchProgress[]> } = {};
  new Gauge({
    name: 'treadwise_batch_jobs',
    help: 'Batch jobs by status (kept until their retention ends).',
    labelNames: ['status'] as const,
    aggregator: 'max',
    registers: [registry],
    async collect() {
      this.reset();
      for (const p of (await batchSource.read?.()) ?? []) this.set({ status: p.status }, p.jobs);
    },
  });
  new Gauge({
    name: 'treadwise_batch_rows',
    help: 'Rows of batch jobs that are queued or running: `pending` still to size, `done` answered.',
    labelNames: ['state'] as const,
    aggregator: 'max',
    registers: [registry],
    async collect() {
      this.reset();
      const active = ((await batchSource.read?.()) ?? []).filter((p) => p.status === 'queued' || p.status === 'running');
      this.set({ state: 'pending' }, active.reduce((n, p) => n + p.rowsTotal - p.rowsDone, 0));
      this.set({ state: 'done' }, active.reduce((n, p) => n + p.rowsDone, 0));
    },
  });

  return {
    registry,
    /** Where the batch gauges read from (the batch job service, once it exists). */
    readBatchesFrom(read: () => Promise<BatchProgress[]>): void {
      batchSource.read = read;
    },
    httpRequests,
    httpDuration,
    refusals,
    quotaUnits,
    /** Runs `work` (the engine) and records how long it took under `operation`. */
    timeEngine<T>(operation: string, work: () => T): T {
      const started = performance.now();
      try {
        return work();
      } finally {
        engineDuration.observe({ operation }, (performance.now() - started) / 1000);
      }
    },
    /** The registries this process answers for (process metrics first). */
    registries(): OpenMetricsRegistry[] {
      return [processMetrics(), registry];
    },
    /** The process and app registries as one OpenMetrics text. */
    async text(): Promise<{ contentType: string; body: string }> {
      // merge keeps the first registry's content type (OpenMetrics); its typing only names the default.
      const merged = Registry.merge(this.registries() as unknown as Registry[]);
      return { contentType: merged.contentType, body: await merged.metrics() };
    },
  };
}

export type Metrics = ReturnType<typeof createMetrics>;

/** Batch jobs of one status, with their rows. */
export interface BatchProgress {
  status: string;
  jobs: number;
  rowsTotal: number;
  rowsDone: number;
}
