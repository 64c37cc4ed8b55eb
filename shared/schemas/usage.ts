import { z } from 'zod';

export const STATUS_CLASSES = ['2xx', '3xx', '4xx', '5xx'] as const;
export type StatusClassName = (typeof STATUS_CLASSES)[number];

/** Longest range one usage query may cover, in days. */
export const MAX_USAGE_RANGE_DAYS = 366;

const utcDate = z.iso.date();
const count = z.number().int().min(0);
const latencyMs = z.number().min(0).nullable();

export const usageQuerySchema = z
  .strictObject({
    from: utcDate.optional().meta({ description: 'First day (UTC, inclusive). Default: 29 days before `to`.', example: '2026-11-03' }),
    to: utcDate.optional().meta({ description: 'Last day (UTC, inclusive). Default: today.', example: '2026-12-02' }),
    keyId: z
      .string()
      .regex(/^[a-z2-7]{12}$/, 'a key id: 12 characters a-z and 2-7')
      .optional()
      .meta({ description: 'Only calls made with this key (the public id shown in key lists).', example: 'h7kq2mzx4c5d' }),
    route: z
      .string()
      .max(200)
      .regex(/^(GET|POST|PUT|PATCH|DELETE) \/v1(\/\S*)?$/, 'a route pattern like `POST /v1/estimates`')
      .optional()
      .meta({ description: 'Only calls to this route pattern.', example: 'POST /v1/estimates' }),
  })
  .meta({ id: 'UsageQuery' });
export type UsageQuery = z.output<typeof usageQuerySchema>;

export const statusClassCountsSchema = z
  .object({ '2xx': count, '3xx': count, '4xx': count, '5xx': count })
  .meta({ id: 'StatusClassCounts', description: 'Calls by status class of the answer.' });

const figures = {
  requests: count.meta({ description: 'Calls made with API keys, whatever the answer.' }),
  limited: count.meta({ description: 'Of those, refused by a rate limit or the monthly quota (429); they do not count against the quota.' }),
  units: count.meta({ description: 'Quota units the calls used: 1 a call, one per item for a synchronous batch (POST /v1/estimates/batch); refused calls use none.' }),
  byStatusClass: statusClassCountsSchema,
  meanLatencyMs: latencyMs.meta({ description: 'Mean time to answer, in ms; null without calls.' }),
  p50LatencyMs: latencyMs.meta({ description: 'Median time to answer, in ms, estimated from latency buckets; null without calls.' }),
  p95LatencyMs: latencyMs.meta({ description: '95th percentile time to answer, in ms, estimated from latency buckets; null without calls.' }),
};

export const routeUsageSchema = z
  .object({ route: z.string().meta({ example: 'POST /v1/estimates' }), ...figures })
  .meta({ id: 'RouteUsage', description: 'Calls to one route pattern.' });

export const dayUsageSchema = z
  .object({
    day: utcDate.meta({ description: 'UTC day.' }),
    ...figures,
    byRoute: z.array(routeUsageSchema).meta({ description: 'The same day by route pattern, busiest first.' }),
  })
  .meta({ id: 'DayUsage', description: 'One UTC day of calls; every day of the range is listed, quiet days with zeros.' });

export const keyUsageSchema = z
  .object({ keyId: z.string(), requests: count, limited: count, units: count })
  .meta({ id: 'KeyUsage', description: 'Calls made with one key over the range.' });

export const usageTotalsSchema = z
  .object({
    ...figures,
    byRoute: z.array(routeUsageSchema),
    byKey: z.array(keyUsageSchema).meta({ description: 'Over the range by key, busiest first.' }),
  })
  .meta({ id: 'UsageTotals', description: 'The whole range.' });

export const quotaStandingSchema = z
  .object({
    planId: z.string().meta({ example: 'shop' }),
    planName: z.string().meta({ example: 'Shop' }),
    monthlyQuota: count.meta({ description: 'Quota units (calls; a synchronous batch uses one per item) the plan includes per calendar month (UTC).' }),
    ratePerMinute: count.meta({ description: 'Calls per minute allowed per API key.' }),
    month: z.string().regex(/^\d{4}-\d{2}$/).meta({ description: 'The current month (UTC).', example: '2026-12' }),
    usedThisMonth: count.meta({ description: 'Quota units used this month: 1 a call, one per item of a synchronous batch (refused calls use none).' }),
    remaining: count,
    percentUsed: z.number().min(0).meta({ description: 'usedThisMonth / monthlyQuota × 100, one decimal.' }),
    resetsAt: z.iso.datetime().meta({ description: 'When the quota starts again (the first day of next month, 00:00 UTC).' }),
  })
  .meta({ id: 'QuotaStanding', description: "The organisation's plan and how much of this month's quota is used." });

// One day of one shop's estimate calls: the figures the documented example repeats per day, route and total.
const exampleStats = {
  requests: 412,
  limited: 3,
  units: 409,
  byStatusClass: { '2xx': 401, '3xx': 0, '4xx': 11, '5xx': 0 },
  meanLatencyMs: 7.4,
  p50LatencyMs: 5.8,
  p95LatencyMs: 21.6,
};
const exampleRoute = { route: 'POST /v1/estimates', ...exampleStats };

export const usageReportSchema = z
  .object({
    from: utcDate,
    to: utcDate,
    filters: z.object({ keyId: z.string().nullable(), route: z.string().nullable() }),
    data: z.array(dayUsageSchema),
    totals: usageTotalsSchema,
    quota: quotaStandingSchema,
  })
  .meta({
    id: 'UsageReport',
    description: "The organisation's API calls by UTC day, with totals and the monthly quota.",
    example: {
      from: '2026-12-01',
      to: '2026-12-01',
      filters: { keyId: null, route: null },
      data: [
        { day: '2026-12-01', ...exampleStats, byRoute: [exampleRoute] },
      ],
      totals: {
        ...exampleStats,
        byRoute: [exampleRoute],
        byKey: [{ keyId: 'h7kq2mzx4c5d', requests: 412, limited: 3, units: 409 }],
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
    },
  });

export type UsageReport = z.infer<typeof usageReportSchema>;
export type DayUsage = z.infer<typeof dayUsageSchema>;
export type RouteUsage = z.infer<typeof routeUsageSchema>;
