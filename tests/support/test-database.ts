import { randomBytes } from 'node:crypto';
import { openDatabase, type Database } from '../../api/db/client.js';
import { migrateDatabase } from '../../api/db/migrate.js';

/**
 * A migrated, empty database for one test file: in-memory PGlite by default (fast), or — when
 * DATABASE_URL is set, as `.ci/run` does — a schema of its own on the real PostgreSQL, so
 * parallel test files never see each other's rows.
 */
export async function createTestDatabase(): Promise<Database> {
  const url = process.env.DATABASE_URL;
  const schemaName = url ? `t_${process.pid}_${randomBytes(4).toString('hex')}` : undefined;
  const database = await openDatabase({ url, schemaName });
  await migrateDatabase(database);
  if (!url) return database;
  return {
    ...database,
    close: async () => {
      await database.db.execute(`drop schema if exists "${schemaName}" cascade`);
      await database.close();
    },
  };
}
