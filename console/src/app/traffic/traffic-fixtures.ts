import type { DayUsage, UsageReport } from '../core/api-types.js';

/** Test support: a usage report in the API's UsageReport shape; figures are invented. */
export function day(date: string, requests: number, over: Partial<DayUsage> = {}): DayUsage {
  return {
    day: date,
    requests,
    limited: 0,
    units: requests,
    byStatusClass: { '2xx': requests, '3xx': 0, '4xx': 0, '5xx': 0 },
    meanLatencyMs: requests ? 7 : null,
    p50LatencyMs: requests ? 5.8 : null,
    p95LatencyMs: requests ? 21.6 : null,
    byRoute: [],
    ...over,
  };
}

export function report(days: DayUsage[], byKey: Array<{ keyId: string; requests: number }>, over: Partial<UsageReport['totals']> = {}): UsageReport {
  const requests = days.reduce((s, d) => s + d.requests, 0);
  const sum = (f: (d: DayUsage) => number) => days.reduce((s, d) => s + f(d), 0);
  return {
    from: days[0]!.day,
    to: days.at(-1)!.day,
    filters: { keyId: null, route: null },
    data: days,
    totals: {
      requests,
      limited: sum((d) => d.limited),
      units: requests,
      byStatusClass: { '2xx': sum((d) => d.byStatusClass['2xx']), '3xx': 0, '4xx': sum((d) => d.byStatusClass['4xx']), '5xx': sum((d) => d.byStatusClass['5xx']) },
      meanLatencyMs: 7,
      p50LatencyMs: 5.8,
      p95LatencyMs: 21.6,
      byRoute: [],
      byKey: byKey.map((k) => ({ ...k, limited: 0, units: k.requests })),
      ...over,
    },
    quota: {
      planId: 'shop',
      planName: 'Shop',
      monthlyQuota: 50000,
      ratePerMinute: 600,
      month: '2026-12',
      usedThisMonth: 409,
      remaining: 49591,
      percentUsed: 0.8,
      resetsAt: '2027-01-01T00:00:00.000Z',
    },
  };
}
