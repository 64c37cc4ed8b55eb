import { defineConfig } from 'drizzle-kit';

// Migrations are generated from api/db/schema.ts and applied at start by api/db/migrate.ts,
// on PGlite and on a real PostgreSQL alike.
export default defineConfig({
  dialect: 'postgresql',
  schema: './api/db/schema.ts',
  out: './migrations',
  strict: true,
  verbose: true,
});
