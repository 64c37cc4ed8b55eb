import { and, eq } from 'drizzle-orm';
import type { Db } from '../db/client.js';
import { memberships, users } from '../db/schema.js';

/** E-mail addresses of an organisation's admins: who hears about keys and quotas. */
export async function adminEmails(db: Db, organizationId: string): Promise<string[]> {
  const rows = await db
    .select({ email: users.email })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organizationId, organizationId), eq(memberships.role, 'admin')));
  return rows.map((r) => r.email);
}
