import { Router, type Response } from 'express';
import { eq } from 'drizzle-orm';
import { z } from 'zod';
import { MAX_USAGE_RANGE_DAYS, quotaStandingSchema, usageQuerySchema, usageReportSchema, type UsageQuery } from '../../shared/schemas/usage.js';
import { organizationOf } from '../auth/principal.js';
import { organizations } from '../db/schema.js';
import { writeCsv, type CsvRow } from '../../shared/tables/csv.js';
import type { AppDeps } from '../deps.js';
import { validateQuery } from '../middleware/validate.js';
import { problemResponse } from '../openapi/document.js';
import { problems } from '../problem.js';
import type { Services } from '../services/container.js';
import { LATENCY_BOUNDS_MS, estimatePercentile } from '../services/latency-histogram.js';
import type { QuotaStanding } from '../services/quotas.js';
import { utcDay } from '../services/usage-meter.js';
import { addDays, daysBetween, summarizeUsage, usageRows, type UsageCounterRow, type UsageRange } from '../services/usage-report.js';
import type { RouteModule } from './route-module.js';

function rangeOf(query: UsageQuery, today: string): UsageRange {
  const to = query.to ?? today;
  const from = query.from ?? addDays(to, -(30 - 1));
  if (from > to) throw problems.validation([{ path: 'from', message: 'must not be after `to`' }], 'The query string is not valid.');
  if (daysBetween(from, to) + 1 > MAX_USAGE_RANGE_DAYS) {
    throw problems.validation([{ path: 'from', message: `at most ${MAX_USAGE_RANGE_DAYS} days from \`to\`` }], 'The query string is not valid.');
  }
  return { from, to, keyId: query.keyId, route: query.route };
}

function quotaView(s: QuotaStanding): z.infer<typeof quotaStandingSchema> {
  return {
    planId: s.plan.id,
    planName: s.plan.name,
    monthlyQuota: s.plan.monthlyQuota,
    ratePerMinute: s.plan.ratePerMinute,
    month: s.month,
    usedThisMonth: s.used,
    remaining: s.remaining,
    percentUsed: s.plan.monthlyQuota > 0 ? Math.round((s.used / s.plan.monthlyQuota) * 1000) / 10 : 100,
    resetsAt: s.resetsAt.toISOString(),
  };
}

const BUCKET_COLUMNS = [...LATENCY_BOUNDS_MS.map((b) => `le_${b}ms`), `gt_${LATENCY_BOUNDS_MS[LATENCY_BOUNDS_MS.length - 1]}ms`];
const CSV_HEADER = ['day', 'key_id', 'route', 'status_class', 'requests', 'limited', 'units', 'latency_ms_total', 'p50_latency_ms', 'p95_latency_ms', ...BUCKET_COLUMNS];

function csvRow(row: UsageCounterRow): CsvRow {
  return [
    row.day,
    row.keyId,
    row.route,
    row.statusClass,
    row.count,
    row.limited,
    row.units,
    row.latencyMsTotal,
    estimatePercentile(row.latencyBuckets, 50),
    estimatePercentile(row.latencyBuckets, 95),
    ...BUCKET_COLUMNS.map((_, i) => row.latencyBuckets[i] ?? 0),
  ];
}

/** Both usage routes read what was just served: the meter's buffer is written first. */
async function readUsage(deps: AppDeps, services: Services, res: Response) {
  const organizationId = organizationOf(res);
  const range = rangeOf(res.locals.query as UsageQuery, utcDay(deps.clock()));
  await services.usageMeter.flush();
  const rows = await usageRows(deps.database.db, organizationId, range);
  return { organizationId, range, rows };
}

export const usageRoutes: RouteModule = {
  basePath: '/v1/usage',

  router(deps, services) {
    const router = Router();

    router.get('/', validateQuery(usageQuerySchema), async (_req, res) => {
      const { organizationId, range, rows } = await readUsage(deps, services, res);
      const standing = await services.quotas.standing(organizationId);
      res.setHeader('Cache-Control', 'no-store');
      res.json({
        from: range.from,
        to: range.to,
        filters: { keyId: range.keyId ?? null, route: range.route ?? null },
        ...summarizeUsage(rows, range),
        quota: quotaView(standing),
      });
    });

    router.get('/export', validateQuery(usageQuerySchema), async (_req, res) => {
      const { organizationId, range, rows } = await readUsage(deps, services, res);
      const [org] = await deps.database.db.select({ slug: organizations.slug }).from(organizations).where(eq(organizations.id, organizationId));
      const filename = `treadwise-usage-${org?.slug ?? 'organisation'}-${range.from}-to-${range.to}.csv`;
      res.setHeader('Cache-Control', 'no-store');
      res.setHeader('Content-Disposition', `attachment; filename="${filename}"`);
      // No byte-order mark: the export is ASCII and has always been read by scripts without one.
      res.type('text/csv; charset=utf-8').send(writeCsv([CSV_HEADER, ...rows.map(csvRow)], { byteOrderMark: false }));
    });

    return router;
  },

  docs(registry) {
    const security = [{ bearer: [] }];
    const errors = {
      400: problemResponse('A filter is malformed, `from` is after `to`, or the range is longer than 366 days (`validation_failed`).'),
      401: problemResponse('No or invalid credentials.'),
      403: problemResponse('Needs the viewer role (users) or the usage:read scope (keys).'),
      429: problemResponse('Too many requests (`rate_limited`) or the monthly quota is used up (`quota_exceeded`); see Retry-After.'),
    };
    registry.registerPath({
      method: 'get',
      path: '/v1/usage',
      tags: ['Usage'],
      operationId: 'getUsage',
      summary: 'API usage by day',
      description:
        "The organisation's calls made with API keys, by UTC day (every day of the range, quiet days as zeros), each day by route pattern, " +
        'with counts by status class, calls refused by limits, and latency (mean, and p50/p95 estimated from fixed buckets). ' +
        "`totals` sums the range, by route and by key; `quota` is the plan's monthly quota and how much of it is used. " +
        'Filters: `keyId`, `route` (a pattern like `POST /v1/estimates`), `from` and `to` (UTC dates, inclusive; default the last 30 days). ' +
        'Calls already answered are included: the server writes its buffered counters before answering.',
      security,
      request: { query: usageQuerySchema },
      responses: {
        200: { description: 'Usage by day, totals and the quota.', content: { 'application/json': { schema: usageReportSchema } } },
        ...errors,
      },
    });
    registry.registerPath({
      method: 'get',
      path: '/v1/usage/export',
      tags: ['Usage'],
      operationId: 'exportUsage',
      summary: 'Export API usage as CSV',
      description:
        'The same counters as `GET /v1/usage`, with the same filters, as CSV: one row per day × key × route × status class, with ' +
        '`requests`, `limited`, `units` (quota units used: one per call, one per item of a batch; none for calls refused by a limit), `latency_ms_total`, estimated `p50_latency_ms` / `p95_latency_ms`, and the latency bucket counts ' +
        `(${BUCKET_COLUMNS.join(', ')}), so rows can be re-aggregated. Sent as an attachment (Content-Disposition).`,
      security,
      request: { query: usageQuerySchema },
      responses: {
        200: {
          description: 'CSV with a header row (RFC 4180, CRLF line ends).',
          content: { 'text/csv': { schema: z.string().meta({ example: `${CSV_HEADER.join(',')}\r\n2026-12-01,h7kq2mzx4c5d,POST /v1/estimates,2xx,401,0,401,2968,5.8,21.6,180,160,52,9,0,0,0,0,0,0\r\n` }) } },
        },
        ...errors,
      },
    });
  },
};
