import type { DayUsage, UsageReport } from '../core/api-types.js';

/** The filters of the traffic screen, as the usage API takes them. */
export interface TrafficFilter {
  from: string;
  to: string;
  keyId: string | null;
}

/**
 * Longest range the usage API answers (MAX_USAGE_RANGE_DAYS in shared/schemas/usage.ts), copied so this
 * chunk does not pull zod in; traffic-data.spec.ts fails if the two part.
 */
export const MAX_RANGE_DAYS = 366;

/** The API's key-id format (shared/schemas/usage.ts): only such ids can be filtered by. */
export const KEY_ID = /^[a-z2-7]{12}$/;
/** Keys drawn as their own series; the rest of the calls are one "other" series. */
export const CHART_KEYS = 5;
export const OTHER_SERIES = 'Other calls';

const DAY_MS = 86_400_000;

export function utcDay(date: Date): string {
  return date.toISOString().slice(0, 10);
}

/** The last 30 days up to today, the API's own default range. */
export function defaultRange(today: Date): { from: string; to: string } {
  return { from: utcDay(new Date(today.getTime() - 29 * DAY_MS)), to: utcDay(today) };
}

/** Why the API would refuse the range, in the words a form shows; null when it is fine. */
export function rangeProblem(from: string, to: string): string | null {
  const start = Date.parse(`${from}T00:00:00Z`);
  const end = Date.parse(`${to}T00:00:00Z`);
  if (Number.isNaN(start) || Number.isNaN(end)) return 'Give both dates.';
  if (start > end) return 'The first day must not be after the last.';
  if ((end - start) / DAY_MS + 1 > MAX_RANGE_DAYS) return `At most ${MAX_RANGE_DAYS} days at a time.`;
  return null;
}

/** One key's calls per day of the range. */
export interface KeySeries {
  keyId: string;
  label: string;
  requests: number[];
}

/** The keys to draw on their own: the busiest that can be asked for by id, at most CHART_KEYS. */
export function chartKeys(report: UsageReport): string[] {
  return report.totals.byKey
    .filter((k) => KEY_ID.test(k.keyId) && k.requests > 0)
    .slice(0, CHART_KEYS)
    .map((k) => k.keyId);
}

/** Lines a per-key report's days up with the days of the range (the API lists every day, but be safe). */
export function requestsByDay(days: readonly string[], keyDays: readonly DayUsage[]): number[] {
  const byDay = new Map(keyDays.map((d) => [d.day, d.requests]));
  return days.map((day) => byDay.get(day) ?? 0);
}

export interface ChartSeries {
  label: string;
  data: number[];
}

/**
 * Calls per day per key, stacked: one series per key, and what the keys drawn do not explain
 * (other keys, signed-in users' sizing as `console`) as one more, so every bar adds up to the day's calls.
 */
export function callsPerDayPerKey(report: UsageReport, keys: readonly KeySeries[]): { labels: string[]; series: ChartSeries[] } {
  const labels = report.data.map((d) => d.day);
  const series: ChartSeries[] = keys.map((k) => ({ label: k.label, data: k.requests.slice(0, labels.length) }));
  const other = report.data.map((d, i) => Math.max(0, d.requests - keys.reduce((sum, k) => sum + (k.requests[i] ?? 0), 0)));
  if (other.some((n) => n > 0)) series.push({ label: OTHER_SERIES, data: other });
  return { labels, series };
}

/** The headline figures of the range. */
export interface TrafficSummary {
  requests: number;
  errors: number;
  limited: number;
  p50LatencyMs: number | null;
  p95LatencyMs: number | null;
}

export function summarize(report: UsageReport): TrafficSummary {
  const { requests, limited, byStatusClass, p50LatencyMs, p95LatencyMs } = report.totals;
  // 429s are 4xx too; "errors" counts the failures that are not a limit saying "slow down".
  const errors = byStatusClass['4xx'] + byStatusClass['5xx'] - limited;
  return { requests, errors: Math.max(0, errors), limited, p50LatencyMs: p50LatencyMs ?? null, p95LatencyMs: p95LatencyMs ?? null };
}

/** Errors (4xx and 5xx other than 429) of one day. */
export function dayErrors(day: DayUsage): number {
  return Math.max(0, day.byStatusClass['4xx'] + day.byStatusClass['5xx'] - day.limited);
}

/** The file name the API suggests in Content-Disposition, or a plain one. */
export function exportFilename(contentDisposition: string | null, filter: TrafficFilter): string {
  const named = contentDisposition ? /filename="([^"]+)"/.exec(contentDisposition)?.[1] : undefined;
  return named ?? `treadwise-usage-${filter.from}-to-${filter.to}.csv`;
}

// Intl rather than Angular's number pipe: the pipe's module is shared with the first page's code, so
// using it here would move it into the initial bundle.
const WHOLE = new Intl.NumberFormat('en');
const ONE_DECIMAL = new Intl.NumberFormat('en', { maximumFractionDigits: 1 });

/** 50000 → "50,000". */
export function formatCount(value: number): string {
  return WHOLE.format(value);
}

/** 21.64 → "21.6"; null (no calls) → "—". */
export function formatOneDecimal(value: number | null): string {
  return value === null ? '—' : ONE_DECIMAL.format(value);
}
