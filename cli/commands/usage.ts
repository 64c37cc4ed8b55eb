import { Command } from 'commander';
import { z } from 'zod';
import { createApiClient, unwrap } from '../api-client.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { fields, num, table } from '../style.js';
import { requireKey } from '../target.js';

const day = z.iso.date({ error: 'must be a date, YYYY-MM-DD' });
const usageFlags = z.object({ from: day.optional(), to: day.optional(), keyId: z.string().optional(), route: z.string().optional() });

export function usageCommand(io: CliIo): Command {
  const command = new Command('usage')
    .description('API calls by day and the monthly quota (GET /v1/usage; needs usage:read)')
    .option('--from <date>', 'first day, UTC (default: 29 days before --to)')
    .option('--to <date>', 'last day, UTC (default: today)')
    .option('--key-id <keyId>', 'only calls made with this key')
    .option('--route <route>', 'only calls to this route, e.g. "POST /v1/estimates"');
  withExamples(withApiOptions(command), 'treadwise usage', 'treadwise usage --from 2026-11-01 --to 2026-11-30 --route "POST /v1/estimates" --json');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse({ apiUrl: raw.apiUrl, apiKey: raw.apiKey, json: raw.json, color: raw.color });
    const flags = usageFlags.parse({ from: raw.from, to: raw.to, keyId: raw.keyId, route: raw.route });
    const query = Object.fromEntries(Object.entries(flags).filter(([, v]) => v !== undefined));
    const api = createApiClient(io, requireKey(io, opts));
    const usage = await unwrap(api.GET('/v1/usage', { params: { query } }));
    if (opts.json) return io.out(JSON.stringify(usage));

    const q = usage.quota;
    const t = usage.totals;
    io.out(
      fields([
        ['Plan', `${q.planName} (${q.planId}), ${q.ratePerMinute} requests/min`],
        ['Quota', `${q.usedThisMonth} of ${q.monthlyQuota} used in ${q.month} (${num(q.percentUsed, 1)} %), ${q.remaining} left, resets ${q.resetsAt}`],
        ['Period', `${usage.from} to ${usage.to}${flags.keyId ? `, key ${flags.keyId}` : ''}${flags.route ? `, ${flags.route}` : ''}`],
        ['Requests', `${t.requests} (${t.limited} limited; 2xx ${t.byStatusClass['2xx']}, 4xx ${t.byStatusClass['4xx']}, 5xx ${t.byStatusClass['5xx']})`],
        ['Latency', `mean ${num(t.meanLatencyMs, 1)} ms, p50 ${num(t.p50LatencyMs, 1)} ms, p95 ${num(t.p95LatencyMs, 1)} ms`],
      ]),
    );
    const days = usage.data.filter((d) => d.requests > 0);
    if (days.length) {
      io.out('');
      io.out(table(['day', 'requests', 'limited', '4xx', '5xx', 'p95 ms'], days.map((d) => [d.day, String(d.requests), String(d.limited), String(d.byStatusClass['4xx']), String(d.byStatusClass['5xx']), num(d.p95LatencyMs, 1)]), [1, 2, 3, 4, 5]));
    }
    if (t.byRoute.length) {
      io.out('');
      io.out(table(['route', 'requests', 'limited'], t.byRoute.map((r) => [r.route, String(r.requests), String(r.limited)]), [1, 2]));
    }
  });
}
