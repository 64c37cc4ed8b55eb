import { Command } from 'commander';
import { healthSchema, readinessSchema } from '../../shared/schemas/health.js';
import { apiGet, problemMessage } from '../api-client.js';
import { CliError } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, DEFAULT_API_URL } from '../options.js';

export function healthCommand(io: CliIo): Command {
  return new Command('health')
    .description('check that a Treadwise API is up and its database reachable')
    .option('--api-url <url>', 'base URL of the Treadwise API (env TREADWISE_API_URL)', process.env.TREADWISE_API_URL ?? DEFAULT_API_URL)
    .option('--json', 'print the result as JSON')
    .action(async (raw: Record<string, unknown>) => {
      const opts = apiOptionsSchema.parse(raw);
      const live = await apiGet(io, opts.apiUrl, 'v1/health');
      if (live.status !== 200) throw new CliError(`API not healthy: ${problemMessage(live.body, live.status)}`);
      const health = healthSchema.parse(live.body);
      const ready = await apiGet(io, opts.apiUrl, 'v1/health/ready');
      const database = ready.status === 200 && readinessSchema.safeParse(ready.body).success ? 'ok' : 'unavailable';

      if (opts.json) {
        io.out(JSON.stringify({ apiUrl: opts.apiUrl, ...health, database }));
      } else {
        io.out(`API       ${opts.apiUrl}  healthy`);
        io.out(`Version   ${health.version} (engine ${health.engineVersion})`);
        io.out(`Database  ${database === 'ok' ? 'reachable' : `unavailable — ${problemMessage(ready.body, ready.status)}`}`);
      }
      if (database !== 'ok') throw new CliError('database not reachable', 3);
    });
}
