import { createApp } from '../../api/app.js';
import { loadConfig, type Config } from '../../api/config.js';
import type { Database } from '../../api/db/client.js';
import { ephemeralSecrets, type Secrets } from '../../api/auth/secrets.js';
import { createLogger } from '../../api/logger.js';
import { createTestDatabase } from './test-database.js';

/**
 * Tests that count writes need the usage meter to write only when asked: no interval or
 * call-count write during a test (each test file that checks those rules sets its own).
 */
export const QUIET_METER = { USAGE_FLUSH_INTERVAL_MS: '3600000', USAGE_FLUSH_AFTER_CALLS: '1000000' };

export interface TestApp {
  app: ReturnType<typeof createApp>;
  database: Database;
  config: Config;
  secrets: Secrets;
  close(): Promise<void>;
}

/** createApp with an in-memory (or per-worker PostgreSQL) database and a silent logger. */
export async function createTestApp(env: NodeJS.ProcessEnv = {}, clock: () => Date = () => new Date()): Promise<TestApp> {
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', CONSOLE_DIR: '/nonexistent', ...QUIET_METER, ...env });
  const database = await createTestDatabase();
  const secrets = ephemeralSecrets();
  const app = createApp({ config, database, logger: createLogger('silent'), secrets, clock });
  return { app, database, config, secrets, close: () => database.close() };
}
