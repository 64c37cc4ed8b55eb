import { createApp } from '../../api/app.js';
import { loadConfig } from '../../api/config.js';
import { createLogger } from '../../api/logger.js';
import { QUIET_METER, type TestApp } from './test-app.js';

/**
 * Another API instance on the same database and secrets as `t` (so its keys work), as a second
 * server process or a restarted one would be.
 */
export function anotherInstance(t: TestApp, env: NodeJS.ProcessEnv = {}, clock: () => Date = () => new Date()): TestApp['app'] {
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', CONSOLE_DIR: '/nonexistent', ...QUIET_METER, ...env });
  return createApp({ config, database: t.database, logger: createLogger('silent'), secrets: t.secrets, clock });
}

/** What api/server.ts close() does for traffic before the database closes. */
export async function closeTraffic(app: TestApp['app']): Promise<void> {
  await app.locals.services.usageMeter.close();
  await app.locals.services.rateLimitStores.close();
}
