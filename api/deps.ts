import type { Logger } from 'pino';
import type { Secrets } from './auth/secrets.js';
import type { Config } from './config.js';
import type { Database } from './db/client.js';
import type { PaymentsConnection } from './payments/client.js';

/** What the app needs from outside; tests pass their own (in-memory database, silent logger). */
export interface AppDeps {
  config: Config;
  database: Database;
  logger: Logger;
  /** Key-hashing pepper and the access-token signing key (see api/auth/secrets.ts). */
  secrets: Secrets;
  /** Injected so time-dependent rules can be tested by moving time instead of sleeping. */
  clock: () => Date;
  /** The payment provider (or its local simulation); absent, billing answers 503. */
  payments?: PaymentsConnection;
}
