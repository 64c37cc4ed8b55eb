// drizzle-kit writes foreign keys as "public"."table"; strip the schema so the same migrations
// run in any schema (tests give each worker its own on a real PostgreSQL).
import { readdirSync, readFileSync, writeFileSync } from 'node:fs';

const dir = new URL('../migrations/', import.meta.url);
for (const name of readdirSync(dir).filter((f) => f.endsWith('.sql'))) {
  const file = new URL(name, dir);
  const sql = readFileSync(file, 'utf8');
  const fixed = sql.replaceAll('"public".', '');
  if (fixed !== sql) {
    writeFileSync(file, fixed);
    console.log(`unqualified ${name}`);
  }
}
