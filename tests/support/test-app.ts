import { createApp } from '../../api/app.js';
import { loadConfig, type Config } from '../../api/config.js';
import type { Database } from '../../api/db/client.js';
import { ephemeralSecrets, type Secrets } from '../../api/auth/secrets.js';
import { createLogger } from '../../api/logger.js';
import { createTestDatabase } from './test-database.js';

export interface TestApp {
  app: ReturnType<typeof createApp>;
  database: Database;
  config: Config;
  secrets: Secrets;
  close(): Promise<void>;
}

/** createApp with an in-memory (or per-worker PostgreSQL) database and a silent logger. */
export async function createTestApp(env: NodeJS.ProcessEnv = {}, clock: () => Date = () => new Date()): Promise<TestApp> {
  const config = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', CONSOLE_DIR: '/nonexistent', ...env });
  const database = await createTestDatabase();
  const secrets = ephemeralSecrets();
  const app = createApp({ config, database, logger: createLogger('silent'), secrets, clock });
  return { app, database, config, secrets, close: () => database.close() };
}
