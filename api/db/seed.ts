import { count } from 'drizzle-orm';
import type { Database } from './client.js';
import { organizations } from './schema.js';
import { demoOrganizations } from './demo-data.js';

const SEED_LOCK = 740_312;

export interface SeedResult {
  seeded: boolean;
  reason: 'seeded' | 'disabled' | 'not-empty';
}

/**
 * Seeds the demo scenario into an empty database only, so a restart never duplicates it and a
 * database holding real data is never touched.
 */
export async function seedDemo(database: Database, enabled: boolean): Promise<SeedResult> {
  if (!enabled) return { seeded: false, reason: 'disabled' };
  return database.withLock(SEED_LOCK, async (db) => {
    const [{ n }] = await db.select({ n: count() }).from(organizations);
    if (n > 0) return { seeded: false, reason: 'not-empty' as const };
    await db.transaction(async (tx) => {
      await tx.insert(organizations).values([...demoOrganizations]).onConflictDoNothing();
    });
    return { seeded: true, reason: 'seeded' as const };
  });
}
