import cluster from 'node:cluster';
import { randomUUID } from 'node:crypto';
import { AggregatorRegistry, Registry, type MetricObjectWithValues, type MetricValue, type OpenMetricsContentType } from 'prom-client';

type MetricJson = MetricObjectWithValues<MetricValue<string>>;

/**
 * /metrics under WEB_CONCURRENCY: a scrape lands on one worker, but the figures must cover all of
 * them. That worker asks the primary over IPC; the primary collects every worker's metrics as
 * JSON, sums them with prom-client's AggregatorRegistry.aggregate (counters and histograms added,
 * per its aggregators) and answers OpenMetrics text. (prom-client's own clusterMetrics() writes the
 * Prometheus 0.0.4 format, without the `# EOF` OpenMetrics requires, hence this small protocol.)
 */

const ASK = 'treadwise:metrics-ask'; // worker → primary: gather for me
const ANSWER = 'treadwise:metrics-answer'; // primary → worker: the text
const COLLECT = 'treadwise:metrics-collect'; // primary → every worker: your metrics
const COLLECTED = 'treadwise:metrics-collected'; // worker → primary: here they are
const TIMEOUT_MS = 5_000;

interface Message {
  type: string;
  id: string;
  body?: string;
  metrics?: MetricJson[];
  error?: string;
}

/** In a worker: answer the primary's collection with these registries. */
export function shareWorkerRegistries(registries: Registry<OpenMetricsContentType>[]): void {
  process.on('message', (message: Message) => {
    if (message?.type !== COLLECT) return;
    Promise.all(registries.map((r) => r.getMetricsAsJSON())).then(
      (lists) => process.send?.({ type: COLLECTED, id: message.id, metrics: lists.flat() as MetricJson[] } satisfies Message),
      (err: Error) => process.send?.({ type: COLLECTED, id: message.id, error: err.message } satisfies Message),
    );
  });
}

/** Waits for the first message on `source` that `match` accepts, or rejects after the timeout. */
function reply<T>(subscribe: (listener: (m: Message) => void) => () => void, match: (m: Message) => T | undefined, what: string): Promise<T> {
  return new Promise((resolve, reject) => {
    const unsubscribe = subscribe((m) => {
      const found = match(m);
      if (found === undefined) return;
      clearTimeout(timer);
      unsubscribe();
      resolve(found);
    });
    const timer = setTimeout(() => {
      unsubscribe();
      reject(new Error(what));
    }, TIMEOUT_MS);
  });
}

/** In a worker: the whole cluster's metrics, gathered by the primary. */
export async function clusterMetricsText(): Promise<string> {
  const id = randomUUID();
  const answered = reply(
    (listener) => {
      process.on('message', listener);
      return () => process.off('message', listener);
    },
    (m) => (m?.type === ANSWER && m.id === id ? m : undefined),
    'the primary did not answer the metrics request',
  );
  process.send?.({ type: ASK, id } satisfies Message);
  const answer = await answered;
  if (answer.error !== undefined) throw new Error(answer.error);
  return answer.body ?? '';
}

/**
 * Workers that listen: only they answer requests, and only they have their registries shared
 * (a worker still starting — migrations, the batch runner — would not answer a collection).
 */
const listening = new Set<number>();

/** In the primary: every listening worker's metrics, summed, as OpenMetrics text. */
async function gather(): Promise<string> {
  const workers = Object.values(cluster.workers ?? {}).filter((w) => w?.isConnected() && listening.has(w.id));
  const lists = await Promise.all(
    workers.map((worker) => {
      const id = randomUUID();
      const collected = reply(
        (listener) => {
          const onMessage = (m: Message) => listener(m);
          worker!.on('message', onMessage);
          return () => worker!.off('message', onMessage);
        },
        (m) => (m?.type === COLLECTED && m.id === id ? m : undefined),
        `worker ${worker!.id} did not send its metrics`,
      );
      worker!.send({ type: COLLECT, id } satisfies Message);
      return collected.then((m) => {
        if (m.error !== undefined) throw new Error(m.error);
        return m.metrics ?? [];
      });
    }),
  );
  // OpenMetrics names a counter family without `_total` and its sample with it; a plain registry
  // strips the suffix itself, the aggregate does not, so the families are named here.
  const named = lists.map((list) => list.map((m) => (String(m.type) === 'counter' ? { ...m, name: m.name.replace(/_total$/, '') } : m)));
  const registry = AggregatorRegistry.aggregate<OpenMetricsContentType>(named);
  registry.setContentType(Registry.OPENMETRICS_CONTENT_TYPE);
  return registry.metrics();
}

/** In the primary: answers workers' requests with the aggregate of every worker. */
export function serveClusterMetrics(): void {
  cluster.on('listening', (worker) => listening.add(worker.id));
  cluster.on('exit', (worker) => listening.delete(worker.id));
  cluster.on('message', (worker, message: Message) => {
    if (message?.type !== ASK) return;
    gather().then(
      (body) => worker.send({ type: ANSWER, id: message.id, body } satisfies Message),
      (err: Error) => worker.send({ type: ANSWER, id: message.id, error: err.message } satisfies Message),
    );
  });
}

export const OPENMETRICS_CONTENT_TYPE = Registry.OPENMETRICS_CONTENT_TYPE;
