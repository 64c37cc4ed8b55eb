import type { Logger } from 'pino';
import type { Database } from '../db/client.js';
import type { AllowedOrigins } from './allowed-origins.js';
import type { KeyCache } from './key-cache.js';

/** Payloads for the catalog cache; key ids never contain a colon. */
const CATALOG_PREFIX = 'catalog:';
/** Payloads for the plan cache: an organisation's plan changed (billing, the operator). */
const PLAN_PREFIX = 'plan:';

/**
 * Makes a key change (rotate, revoke, create) effective at once on every instance: the instance
 * that made it invalidates its own caches and NOTIFYs the others through the database.
 */
export function createKeyEvents({
  database,
  keyCache,
  allowedOrigins,
  catalog,
  plans,
  logger,
}: {
  database: Database;
  keyCache: KeyCache;
  allowedOrigins: AllowedOrigins;
  /** The priced-catalog cache rides on the same channel (one listening connection per instance). */
  catalog?: { forget(organizationId: string): void };
  /** The plan cache rides on it too, so a plan change is in force on every instance from the next call. */
  plans?: { invalidate(organizationId: string): void };
  logger: Logger;
}) {
  const channel = `treadwise_keys_${database.schemaName}`.slice(0, 63);
  const forget = (payload: string) => {
    if (payload.startsWith(CATALOG_PREFIX)) return catalog?.forget(payload.slice(CATALOG_PREFIX.length));
    if (payload.startsWith(PLAN_PREFIX)) return plans?.invalidate(payload.slice(PLAN_PREFIX.length));
    keyCache.invalidate(payload);
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
    /** A stored catalog changed here: the other instances forget their priced copy. */
    catalogChanged(organizationId: string): void {
      void database
        .publish(channel, `${CATALOG_PREFIX}${organizationId}`)
        .catch((err: Error) => logger.warn({ err: { message: err.message } }, 'catalog change not broadcast'));
    },
    /** An organisation's plan changed here: this instance and the others load it afresh. */
    async planChanged(organizationId: string): Promise<void> {
      forget(`${PLAN_PREFIX}${organizationId}`);
      await database
        .publish(channel, `${PLAN_PREFIX}${organizationId}`)
        .catch((err: Error) => logger.warn({ err: { message: err.message } }, 'plan change not broadcast'));
    },
  };
}

export type KeyEvents = ReturnType<typeof createKeyEvents>;
