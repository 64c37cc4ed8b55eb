import { Command } from 'commander';
import { healthSchema, readinessSchema } from '../../shared/schemas/health.js';
import { apiGet, problemMessage } from '../api-client.js';
import { CliError, EXIT } from '../errors.js';
import type { CliIo } from '../io.js';
import { apiOptionsSchema, withApiOptions, withExamples } from '../options.js';
import { resolveTarget } from '../target.js';

export function healthCommand(io: CliIo): Command {
  const command = new Command('health').description('check that a Treadwise API is up and its database reachable');
  withExamples(withApiOptions(command), 'treadwise health', 'treadwise health --api-url https://api.example.test --json');
  return command.action(async (raw: Record<string, unknown>) => {
    const opts = apiOptionsSchema.parse(raw);
    const { apiUrl } = resolveTarget(io, opts);
    const live = await apiGet(io, apiUrl, 'v1/health');
    if (live.status !== 200) throw new CliError(`API not healthy: ${problemMessage(live.body, live.status)}`);
    const health = healthSchema.parse(live.body);
    const ready = await apiGet(io, apiUrl, 'v1/health/ready');
    const database = ready.status === 200 && readinessSchema.safeParse(ready.body).success ? 'ok' : 'unavailable';

    if (opts.json) {
      io.out(JSON.stringify({ apiUrl, ...health, database }));
    } else {
      io.out(`API       ${apiUrl}  healthy`);
      io.out(`Version   ${health.version} (engine ${health.engineVersion})`);
      io.out(`Database  ${database === 'ok' ? 'reachable' : `unavailable — ${problemMessage(ready.body, ready.status)}`}`);
    }
    if (database !== 'ok') throw new CliError('database not reachable', EXIT.checksFailed);
  });
}
