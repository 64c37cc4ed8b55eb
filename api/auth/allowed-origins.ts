import { and, eq, gt, isNull, or } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { apiKeys } from '../db/schema.js';
import { originAllowed } from './origins.js';

/**
 * Every origin listed by an active embed key, cached briefly: a CORS preflight carries no
 * key, so it can only be answered from the origin alone.
 */
export function createAllowedOrigins({ db, clock, ttlMs = 5_000 }: { db: Db; clock: () => Date; ttlMs?: number }) {
  let patterns: string[] = [];
  let loadedAt = Number.NEGATIVE_INFINITY;
  let loading: Promise<void> | undefined;

  const load = async () => {
    const now = clock();
    const rows = await db
      .select({ origins: apiKeys.allowedOrigins })
      .from(apiKeys)
      .where(and(eq(apiKeys.kind, 'embed'), isNull(apiKeys.revokedAt), or(isNull(apiKeys.expiresAt), gt(apiKeys.expiresAt, now))));
    patterns = [...new Set(rows.flatMap((r) => r.origins))];
    loadedAt = now.getTime();
  };

  return {
    async allows(origin: string): Promise<boolean> {
      if (clock().getTime() - loadedAt >= ttlMs) {
        loading ??= load().finally(() => (loading = undefined));
        await loading;
      }
      return originAllowed(origin, patterns);
    },
    invalidate(): void {
      loadedAt = Number.NEGATIVE_INFINITY;
    },
  };
}

export type AllowedOrigins = ReturnType<typeof createAllowedOrigins>;
