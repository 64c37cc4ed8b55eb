import type { Store } from 'express-rate-limit';
import { Redis } from 'ioredis';
import type { Logger } from 'pino';
import { RedisStore, type RedisReply } from 'rate-limit-redis';

/** Every limiter's keys in Redis start with this, then the limiter's own name. */
export const REDIS_KEY_PREFIX = 'treadwise:rl:';

export interface RateLimitStores {
  kind: 'memory' | 'redis';
  /** A new store for one limiter (each limiter needs its own); undefined: the in-memory default. */
  store(limiterName: string): Store | undefined;
  close(): Promise<void>;
}

/**
 * Where rate-limit hits are counted: in memory (one instance) by default, or in Redis when
 * REDIS_URL is set, so several API instances share one limit.
 */
export function createRateLimitStores(redisUrl: string | undefined, logger: Logger): RateLimitStores {
  if (!redisUrl) return { kind: 'memory', store: () => undefined, close: async () => undefined };

  // Fail fast while Redis is away (the limiter then lets calls through, logged), rather than
  // holding every request in ioredis's retry loop.
  const client = new Redis(redisUrl, { maxRetriesPerRequest: 1, lazyConnect: true });
  client.on('error', (err) => logger.warn({ err }, 'rate-limit Redis unavailable'));
  return {
    kind: 'redis',
    store: (limiterName) =>
      new RedisStore({
        prefix: `${REDIS_KEY_PREFIX}${limiterName}:`,
        sendCommand: (command: string, ...args: string[]) => client.call(command, args) as Promise<RedisReply>,
      }),
    async close() {
      if (client.status === 'wait' || client.status === 'end') return client.disconnect(); // never connected, or gone
      await client.quit().catch(() => client.disconnect());
    },
  };
}
