import { asc, eq } from 'drizzle-orm';
import { z } from 'zod';
import type { MembershipView, UserView } from '../../shared/schemas/accounts.js';
import { hashPassword } from '../auth/passwords.js';
import type { Db } from '../db/client.js';
import { memberships, organizations, signInFailures, users } from '../db/schema.js';
import { problems } from '../problem.js';

export type UserRow = typeof users.$inferSelect;

export interface CreateUserInput {
  email: string;
  name?: string | null;
  /** Omitted: the account cannot sign in until a password is set (reset or invitation). */
  password?: string | null;
  operator?: boolean;
}

/** E-mail addresses are stored lower-cased, so look-ups ignore case. */
export function normalizeEmail(email: string): string {
  return email.trim().toLowerCase();
}

export function userView(row: UserRow): UserView {
  return { id: row.id, email: row.email, name: row.name, operator: row.operator };
}

export function createUserService({ db, clock }: { db: Db; clock: () => Date }) {
  return {
    view: userView,

    /** A new account; the same e-mail twice is a 409 `email_taken`. */
    async createUser(input: CreateUserInput, tx: Db = db): Promise<UserView> {
      const email = normalizeEmail(input.email);
      if (!z.email().safeParse(email).success) throw problems.validation([{ path: 'email', message: 'not an e-mail address' }]);
      const passwordHash = input.password ? await hashPassword(input.password) : null;
      const [row] = await tx
        .insert(users)
        .values({ email, name: input.name ?? null, passwordHash, operator: input.operator ?? false, createdAt: clock() })
        .onConflictDoNothing({ target: users.email })
        .returning();
      if (!row) throw problems.conflict('email_taken', `An account for ${email} already exists.`);
      return userView(row);
    },

    async findByEmail(email: string, tx: Db = db): Promise<UserRow | undefined> {
      const [row] = await tx.select().from(users).where(eq(users.email, normalizeEmail(email)));
      return row;
    },

    async get(id: string, tx: Db = db): Promise<UserRow | undefined> {
      if (!z.uuid().safeParse(id).success) return undefined;
      const [row] = await tx.select().from(users).where(eq(users.id, id));
      return row;
    },

    /** Sets a new password and lifts any sign-in lockout. */
    async setPassword(userId: string, password: string, tx: Db = db): Promise<void> {
      const passwordHash = await hashPassword(password);
      await tx.update(users).set({ passwordHash }).where(eq(users.id, userId));
      await tx.delete(signInFailures).where(eq(signInFailures.userId, userId));
    },

    /** The organisations a user belongs to, by slug. */
    async membershipsOf(userId: string, tx: Db = db): Promise<MembershipView[]> {
      const rows = await tx
        .select({ id: organizations.id, slug: organizations.slug, name: organizations.name, role: memberships.role })
        .from(memberships)
        .innerJoin(organizations, eq(organizations.id, memberships.organizationId))
        .where(eq(memberships.userId, userId))
        .orderBy(asc(organizations.slug));
      return rows.map((r) => ({ organization: { id: r.id, slug: r.slug, name: r.name }, role: r.role }));
    },
  };
}

export type UserService = ReturnType<typeof createUserService>;
