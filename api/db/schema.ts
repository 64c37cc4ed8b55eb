import { pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

/** Partner organisations (shops, builders, studios) that use Treadwise under their own keys. */
export const organizations = pgTable('organizations', {
  id: uuid('id').primaryKey().defaultRandom(),
  slug: text('slug').notNull().unique(),
  name: text('name').notNull(),
  createdAt: timestamp('created_at', { withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp('updated_at', { withTimezone: true }).notNull().defaultNow(),
});
