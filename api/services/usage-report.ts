import { and, asc, eq, gte, lte } from 'drizzle-orm';
import type { RouteUsage, UsageReport } from '../../shared/schemas/usage.js';
import type { Db } from '../db/client.js';
import { usageCounters } from '../db/schema.js';
import { addBuckets, emptyBuckets, estimatePercentile } from './latency-histogram.js';

export type UsageCounterRow = typeof usageCounters.$inferSelect;

export interface UsageRange {
  from: string; // YYYY-MM-DD, inclusive
  to: string;
  keyId?: string;
  route?: string;
}

const DAY_MS = 86_400_000;

export function addDays(day: string, days: number): string {
  return new Date(Date.parse(`${day}T00:00:00Z`) + days * DAY_MS).toISOString().slice(0, 10);
}

export function daysBetween(from: string, to: string): number {
  return Math.round((Date.parse(`${to}T00:00:00Z`) - Date.parse(`${from}T00:00:00Z`)) / DAY_MS);
}

/** The organisation's counter rows in the range, one per day × key × route × status class. */
export async function usageRows(db: Db, organizationId: string, range: UsageRange): Promise<UsageCounterRow[]> {
  return db
    .select()
    .from(usageCounters)
    .where(
      and(
        eq(usageCounters.organizationId, organizationId),
        gte(usageCounters.day, range.from),
        lte(usageCounters.day, range.to),
        range.keyId ? eq(usageCounters.keyId, range.keyId) : undefined,
        range.route ? eq(usageCounters.route, range.route) : undefined,
      ),
    )
    .orderBy(asc(usageCounters.day), asc(usageCounters.keyId), asc(usageCounters.route), asc(usageCounters.statusClass));
}

/** Sums counter rows; percentiles come from the summed latency buckets. */
class Tally {
  requests = 0;
  limited = 0;
  units = 0;
  latencyMs = 0;
  byStatusClass = { '2xx': 0, '3xx': 0, '4xx': 0, '5xx': 0 };
  buckets = emptyBuckets();

  add(row: UsageCounterRow): this {
    this.requests += row.count;
    this.limited += row.limited;
    this.units += row.units;
    this.latencyMs += row.latencyMsTotal;
    const cls = row.statusClass as keyof Tally['byStatusClass'];
    if (cls in this.byStatusClass) this.byStatusClass[cls] += row.count;
    addBuckets(this.buckets, row.latencyBuckets);
    return this;
  }

  figures() {
    return {
      requests: this.requests,
      limited: this.limited,
      units: this.units,
      byStatusClass: { ...this.byStatusClass },
      meanLatencyMs: this.requests ? Math.round((this.latencyMs / this.requests) * 10) / 10 : null,
      p50LatencyMs: estimatePercentile(this.buckets, 50),
      p95LatencyMs: estimatePercentile(this.buckets, 95),
    };
  }
}

function byRoute(rows: UsageCounterRow[]): RouteUsage[] {
  const routes = new Map<string, Tally>();
  for (const row of rows) {
    const t = routes.get(row.route) ?? new Tally();
    routes.set(row.route, t.add(row));
  }
  return [...routes.entries()]
    .map(([route, t]) => ({ route, ...t.figures() }))
    .sort((a, b) => b.requests - a.requests || a.route.localeCompare(b.route));
}

/** Every day of the range (quiet days as zeros), by route, with totals and per-key totals. */
export function summarizeUsage(rows: UsageCounterRow[], range: UsageRange): Pick<UsageReport, 'data' | 'totals'> {
  const byDay = new Map<string, UsageCounterRow[]>();
  for (const row of rows) {
    const list = byDay.get(row.day);
    if (list) list.push(row);
    else byDay.set(row.day, [row]);
  }

  const data = [];
  for (let day = range.from; day <= range.to; day = addDays(day, 1)) {
    const dayRows = byDay.get(day) ?? [];
    const t = new Tally();
    for (const row of dayRows) t.add(row);
    data.push({ day, ...t.figures(), byRoute: byRoute(dayRows) });
  }

  const total = new Tally();
  const keys = new Map<string, { requests: number; limited: number; units: number }>();
  for (const row of rows) {
    total.add(row);
    const k = keys.get(row.keyId) ?? { requests: 0, limited: 0, units: 0 };
    k.requests += row.count;
    k.limited += row.limited;
    k.units += row.units;
    keys.set(row.keyId, k);
  }
  const byKey = [...keys.entries()]
    .map(([keyId, k]) => ({ keyId, ...k }))
    .sort((a, b) => b.requests - a.requests || a.keyId.localeCompare(b.keyId));

  return { data, totals: { ...total.figures(), byRoute: byRoute(rows), byKey } };
}
