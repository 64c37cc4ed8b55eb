import type { Logger } from 'pino';
import type { Database } from '../db/client.js';
import type { AllowedOrigins } from './allowed-origins.js';
import type { KeyCache } from './key-cache.js';

/**
 * Makes a key change (rotate, revoke, create) effective at once on every instance: the instance
 * that made it invalidates its own caches and NOTIFYs the others through the database.
 */
export function createKeyEvents({ database, keyCache, allowedOrigins, logger }: { database: Database; keyCache: KeyCache; allowedOrigins: AllowedOrigins; logger: Logger }) {
  const channel = `treadwise_keys_${database.schemaName}`.slice(0, 63);
  const forget = (keyId: string) => {
    keyCache.invalidate(keyId);
    allowedOrigins.invalidate();
  };
  const listening = database.subscribe(channel, forget).catch((err: Error) => {
    // Without the listener, other instances' changes still arrive within the caches' TTL.
    logger.warn({ err: { message: err.message } }, 'key change notifications unavailable');
  });
  return {
    listening,
    async changed(keyId: string): Promise<void> {
      forget(keyId);
      await database.publish(channel, keyId).catch((err: Error) => logger.warn({ err: { message: err.message } }, 'key change not broadcast'));
    },
  };
}

export type KeyEvents = ReturnType<typeof createKeyEvents>;
