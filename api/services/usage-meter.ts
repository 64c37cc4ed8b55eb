import { inArray, sql } from 'drizzle-orm';
import type { Logger } from 'pino';
import type { Db } from '../db/client.js';
import { apiKeys, organizations, usageCounters } from '../db/schema.js';
import { addBuckets, bucketIndex, emptyBuckets } from './latency-histogram.js';

export type StatusClass = '2xx' | '3xx' | '4xx' | '5xx';

/** One request made with an API key, as the traffic middleware saw it. */
export interface UsageSample {
  organizationId: string;
  /** Public key id (`tw_server_<keyId>_…`), the one shown in charts; `console` for signed-in users' sizing. */
  keyId: string;
  /** Row id of the key, for `api_keys.last_used_at`; null for console users' sizing calls. */
  apiKeyId: string | null;
  /** When the request arrived, on the injected clock; its UTC day is the counter's day. */
  at: Date;
  /** Route pattern as in the policy table, e.g. `POST /v1/estimates`. */
  route: string;
  status: number;
  latencyMs: number;
  /** Refused by a rate limit or the monthly quota. */
  limited: boolean;
  /** Quota units the call used: 1 by default, one per item for a synchronous batch, 0 when limited. */
  units?: number;
}

/**
 * Told when the buffer is taken for writing (synchronously, in the same tick), so a monthly
 * tally kept beside the meter knows which of its counts the database holds once the write is
 * done. `idle` lets close() wait for work the observer started (quota e-mails).
 */
export interface FlushObserver {
  flushing(): { written(): Promise<void> };
  idle?(): Promise<void>;
}

interface Counter {
  organizationId: string;
  keyId: string;
  day: string;
  route: string;
  statusClass: StatusClass;
  count: number;
  limited: number;
  units: number;
  latencyMs: number;
  buckets: number[];
}

const ROWS_PER_STATEMENT = 500;
const FOREIGN_KEY_VIOLATION = '23503';

export function statusClassOf(status: number): StatusClass {
  if (status >= 500) return '5xx';
  if (status >= 400) return '4xx';
  if (status >= 300) return '3xx';
  return '2xx';
}

export function utcDay(at: Date): string {
  return at.toISOString().slice(0, 10);
}

/**
 * Counts requests in memory and writes them in batches (the hot path does no writes): every
 * `flushIntervalMs`, as soon as `flushAfterCalls` calls wait, on flush() (read-your-writes before
 * a usage query) and on close() (graceful shutdown). A crash therefore loses at most the calls
 * answered since the last write — fewer than `flushAfterCalls`, or one interval's worth, plus
 * those answered while a write is under way — so a quota cannot be escaped by crashing. A failed
 * write keeps the counts for the next attempt, so none are lost or counted twice.
 */
export function createUsageMeter({
  db,
  logger,
  flushIntervalMs,
  flushAfterCalls = Number.POSITIVE_INFINITY,
  observer,
}: {
  db: Db;
  logger: Logger;
  flushIntervalMs: number;
  /** Start a write as soon as this many calls are buffered. */
  flushAfterCalls?: number;
  observer?: FlushObserver;
}) {
  let counters = new Map<string, Counter>();
  let lastUsed = new Map<string, Date>();
  let pending = 0; // calls in `counters`
  let chain: Promise<void> = Promise.resolve();
  let countTriggered: Promise<void> | undefined;

  const add = (c: Counter) => {
    pending += c.count;
    const id = [c.organizationId, c.keyId, c.day, c.route, c.statusClass].join('\u0000');
    const existing = counters.get(id);
    if (!existing) return void counters.set(id, c);
    existing.count += c.count;
    existing.limited += c.limited;
    existing.units += c.units;
    existing.latencyMs += c.latencyMs;
    addBuckets(existing.buckets, c.buckets);
  };

  const touch = (apiKeyId: string, at: Date) => {
    const seen = lastUsed.get(apiKeyId);
    if (!seen || seen < at) lastUsed.set(apiKeyId, at);
  };

  const writeCounters = async (tx: Db, rows: Counter[]) => {
    for (let i = 0; i < rows.length; i += ROWS_PER_STATEMENT) {
      await tx
        .insert(usageCounters)
        .values(
          rows.slice(i, i + ROWS_PER_STATEMENT).map((c) => ({
            organizationId: c.organizationId,
            keyId: c.keyId,
            day: c.day,
            route: c.route,
            statusClass: c.statusClass,
            count: c.count,
            limited: c.limited,
            units: c.units,
            latencyMsTotal: Math.round(c.latencyMs),
            latencyBuckets: c.buckets,
          })),
        )
        .onConflictDoUpdate({
          target: [usageCounters.organizationId, usageCounters.keyId, usageCounters.day, usageCounters.route, usageCounters.statusClass],
          set: {
            count: sql`${usageCounters.count} + excluded.count`,
            limited: sql`${usageCounters.limited} + excluded.limited`,
            units: sql`${usageCounters.units} + excluded.units`,
            latencyMsTotal: sql`${usageCounters.latencyMsTotal} + excluded.latency_ms_total`,
            latencyBuckets: sql`array(select coalesce(a, 0) + coalesce(b, 0) from unnest(${usageCounters.latencyBuckets}, excluded.latency_buckets) with ordinality as t(a, b, i) order by i)`,
          },
        });
    }
  };

  const writeLastUsed = async (tx: Db, entries: [string, Date][]) => {
    if (entries.length === 0) return;
    const values = sql.join(
      entries.map(([id, at]) => sql`(${id}::uuid, ${at.toISOString()}::timestamptz)`),
      sql`, `,
    );
    // Only ever moves forward: another instance may have written a later time.
    await tx.execute(
      sql`update ${apiKeys} set last_used_at = v.at from (values ${values}) as v(id, at)
          where ${apiKeys.id} = v.id and (${apiKeys.lastUsedAt} is null or ${apiKeys.lastUsedAt} < v.at)`,
    );
  };

  const write = async (rows: Counter[], used: [string, Date][]) => {
    try {
      await db.transaction(async (tx) => {
        await writeCounters(tx as unknown as Db, rows);
        await writeLastUsed(tx as unknown as Db, used);
      });
    } catch (err) {
      const code = (err as { code?: string; cause?: { code?: string } }).cause?.code ?? (err as { code?: string }).code;
      if (code !== FOREIGN_KEY_VIOLATION) throw err;
      // An organisation was deleted while its counts were buffered: drop those, keep the rest.
      const ids = [...new Set(rows.map((r) => r.organizationId))];
      const live = new Set((await db.select({ id: organizations.id }).from(organizations).where(inArray(organizations.id, ids))).map((o) => o.id));
      const kept = rows.filter((r) => live.has(r.organizationId));
      logger.warn({ dropped: rows.length - kept.length }, 'usage counters of deleted organisations dropped');
      await db.transaction(async (tx) => {
        await writeCounters(tx as unknown as Db, kept);
        await writeLastUsed(tx as unknown as Db, used);
      });
    }
  };

  const flushOnce = async () => {
    // Taken in one tick, together with the observer's snapshot.
    const rows = [...counters.values()];
    const used = [...lastUsed.entries()];
    counters = new Map();
    lastUsed = new Map();
    pending = 0;
    const tally = observer?.flushing();
    if (rows.length > 0 || used.length > 0) {
      try {
        await write(rows, used);
        logger.debug({ requests: rows.reduce((n, r) => n + r.count, 0) }, 'usage counters written');
      } catch (err) {
        for (const row of rows) add(row);
        for (const [id, at] of used) touch(id, at);
        throw err;
      }
    }
    await tally?.written();
  };

  const flush = (): Promise<void> => {
    const run = chain.then(flushOnce);
    chain = run.catch(() => undefined);
    return run;
  };

  /**
   * One write at a time for the count rule; another follows at once if the calls answered
   * meanwhile reached the count again. A failed write is retried by the timer, not in a loop.
   */
  const flushForCount = () => {
    if (countTriggered || pending < flushAfterCalls) return;
    countTriggered = flush().then(
      () => {
        countTriggered = undefined;
        flushForCount();
      },
      (err) => {
        countTriggered = undefined;
        logger.error({ err }, 'usage counters not written; will retry');
      },
    );
  };

  const timer = setInterval(() => {
    flush().catch((err) => logger.error({ err }, 'usage counters not written; will retry'));
  }, flushIntervalMs);
  // The timer must not keep a finished process alive; close() writes what is left.
  timer.unref();

  return {
    record(sample: UsageSample): void {
      const buckets = emptyBuckets();
      buckets[bucketIndex(sample.latencyMs)] = 1;
      add({
        organizationId: sample.organizationId,
        keyId: sample.keyId,
        day: utcDay(sample.at),
        route: sample.route,
        statusClass: statusClassOf(sample.status),
        count: 1,
        limited: sample.limited ? 1 : 0,
        units: sample.limited ? 0 : (sample.units ?? 1),
        latencyMs: sample.latencyMs,
        buckets,
      });
      if (sample.apiKeyId) touch(sample.apiKeyId, sample.at);
      flushForCount();
    },

    /** Writes everything recorded so far; resolves once it is in the database. */
    flush,

    /** Requests recorded and not yet written (for tests and diagnostics). */
    pendingRequests(): number {
      return pending;
    },

    /** Resolves once every write started so far has ended (for tests: no waiting on the clock). */
    async settled(): Promise<void> {
      // A write for the count may start another when it ends: wait until none follows.
      for (;;) {
        const seen = chain;
        await seen;
        await countTriggered;
        if (seen === chain && countTriggered === undefined) return;
      }
    },

    /** Graceful shutdown: stop the timer, write what is left, wait for the observer's work. */
    async close(): Promise<void> {
      clearInterval(timer);
      await flush();
      await observer?.idle?.();
    },
  };
}

export type UsageMeter = ReturnType<typeof createUsageMeter>;
