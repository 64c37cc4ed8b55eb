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
  /** Weighted counters (the cost budget) kept beside the limiters' hits, in the same place. */
  costs: CostCounter;
  close(): Promise<void>;
}

export interface CostSpend {
  /** False when the cost would have passed the limit: nothing was added. */
  allowed: boolean;
  /** Units spent in the current window, after this call when allowed. */
  used: number;
  /** Milliseconds until the window ends and the budget is whole again. */
  resetMs: number;
}

/**
 * Fixed-window counters that add a weight per call, not 1 (express-rate-limit's stores count
 * hits only). A call is charged only if it fits, so one refused large call does not use up the
 * budget of the small ones behind it.
 */
export interface CostCounter {
  spend(key: string, cost: number, limit: number, windowMs: number): Promise<CostSpend>;
}

/** One instance: a Map of windows, pruned of ended ones when it grows. */
export function memoryCostCounter(now: () => number = Date.now): CostCounter {
  const windows = new Map<string, { used: number; resetAt: number }>();
  return {
    async spend(key, cost, limit, windowMs) {
      const t = now();
      let w = windows.get(key);
      if (!w || w.resetAt <= t) {
        if (windows.size >= 10_000) for (const [k, v] of windows) if (v.resetAt <= t) windows.delete(k);
        w = { used: 0, resetAt: t + windowMs };
        windows.set(key, w);
      }
      const allowed = w.used + cost <= limit;
      if (allowed) w.used += cost;
      return { allowed, used: w.used, resetMs: w.resetAt - t };
    },
  };
}

// Atomic check-and-add: a window starts at the first spend and ends with the key's expiry.
const SPEND_SCRIPT = `
local ttl = redis.call('PTTL', KEYS[1])
if ttl < 0 then redis.call('SET', KEYS[1], 0, 'PX', ARGV[3]); ttl = tonumber(ARGV[3]) end
local used = tonumber(redis.call('GET', KEYS[1]))
local cost = tonumber(ARGV[1])
if used + cost > tonumber(ARGV[2]) then return {0, used, ttl} end
return {1, redis.call('INCRBY', KEYS[1], cost), ttl}
`;

/**
 * Where rate-limit hits are counted: in memory (one instance) by default, or in Redis when
 * REDIS_URL is set, so several API instances share one limit.
 */
export function createRateLimitStores(redisUrl: string | undefined, logger: Logger): RateLimitStores {
  if (!redisUrl) return { kind: 'memory', store: () => undefined, costs: memoryCostCounter(), close: async () => undefined };

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
    costs: {
      async spend(key, cost, limit, windowMs) {
        const [allowed, used, resetMs] = (await client.eval(SPEND_SCRIPT, 1, `${REDIS_KEY_PREFIX}${key}`, cost, limit, windowMs)) as [number, number, number];
        return { allowed: allowed === 1, used, resetMs };
      },
    },
    async close() {
      if (client.status === 'wait' || client.status === 'end') return client.disconnect(); // never connected, or gone
      await client.quit().catch(() => client.disconnect());
    },
  };
}
