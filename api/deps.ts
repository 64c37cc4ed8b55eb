import type { Logger } from 'pino';
import type { Config } from './config.js';
import type { Database } from './db/client.js';

/** What the app needs from outside; tests pass their own (in-memory database, silent logger). */
export interface AppDeps {
  config: Config;
  database: Database;
  logger: Logger;
  /** Injected so time-dependent rules can be tested by moving time instead of sleeping. */
  clock: () => Date;
}
