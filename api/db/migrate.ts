import { fileURLToPath } from 'node:url';
import path from 'node:path';
import { existsSync } from 'node:fs';
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator';
import type { PgliteDatabase } from 'drizzle-orm/pglite';
import { migrate as migratePg } from 'drizzle-orm/node-postgres/migrator';
import type { NodePgDatabase } from 'drizzle-orm/node-postgres';
import type { Database } from './client.js';

const MIGRATION_LOCK = 740_311; // arbitrary, constant across releases

/** Finds migrations/ both from the sources (api/db) and from the bundle (dist/server). */
export function migrationsFolder(): string {
  const here = path.dirname(fileURLToPath(import.meta.url));
  const candidates = [path.resolve(here, '../../migrations'), path.resolve(here, '../migrations'), path.resolve('migrations')];
  const found = candidates.find((dir) => existsSync(path.join(dir, 'meta/_journal.json')));
  if (!found) throw new Error('migrations folder not found');
  return found;
}

export async function migrateDatabase(database: Database): Promise<void> {
  const config = {
    migrationsFolder: migrationsFolder(),
    // Keep the bookkeeping table beside the tables, so per-worker schemas don't share it.
    migrationsSchema: database.schemaName === 'public' ? 'drizzle' : database.schemaName,
  };
  await database.withLock(MIGRATION_LOCK, async (db) => {
    if (database.kind === 'pglite') await migratePglite(db as unknown as PgliteDatabase, config);
    else await migratePg(db as unknown as NodePgDatabase, config);
  });
}
