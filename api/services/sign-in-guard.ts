import { and, eq } from 'drizzle-orm';
import { verifyPassword } from '../auth/passwords.js';
import type { Db } from '../db/client.js';
import { signInFailures } from '../db/schema.js';

/**
 * Lockout: the 5th failure in a row from one source locks the account *for that source* for 1
 * minute; each further failure after a lock doubles it, up to 1 hour. Common practice, no
 * published source for these numbers.
 */
export const LOCKOUT = { freeFailures: 5, firstLockMs: 60_000, maxLockMs: 3_600_000 } as const;

export function lockDurationMs(failures: number): number {
  if (failures < LOCKOUT.freeFailures) return 0;
  const doublings = Math.min(failures - LOCKOUT.freeFailures, 20);
  return Math.min(LOCKOUT.firstLockMs * 2 ** doublings, LOCKOUT.maxLockMs);
}

export type PasswordCheck = 'ok' | 'wrong' | 'locked';

/**
 * Every check of an existing account's password (sign-in, and confirming an invitation to an
 * existing account) goes through here, so every path counts towards the same lockout.
 *
 * While a lock applies the password is still hashed and compared, and the caller answers exactly
 * as for a wrong password: neither the answer nor its timing tells that the account exists or is
 * locked. Guesses made while locked cannot succeed and are not counted.
 */
export function createSignInGuard({ db, clock }: { db: Db; clock: () => Date }) {
  return {
    async check(user: { id: string; passwordHash: string | null }, password: string, source: string): Promise<PasswordCheck> {
      const where = and(eq(signInFailures.userId, user.id), eq(signInFailures.source, source));
      const [row] = await db.select().from(signInFailures).where(where);
      const now = clock();
      const valid = await verifyPassword(user.passwordHash, password);
      if (row?.lockedUntil && row.lockedUntil > now) return 'locked';
      if (valid) {
        if (row) await db.delete(signInFailures).where(where);
        return 'ok';
      }
      const failures = (row?.failures ?? 0) + 1;
      const lockMs = lockDurationMs(failures);
      const lockedUntil = lockMs > 0 ? new Date(now.getTime() + lockMs) : null;
      await db
        .insert(signInFailures)
        .values({ userId: user.id, source, failures, lockedUntil, updatedAt: now })
        .onConflictDoUpdate({ target: [signInFailures.userId, signInFailures.source], set: { failures, lockedUntil, updatedAt: now } });
      return 'wrong';
    },

    /** Until when `source` is locked out of the account (tests and support read it). */
    async lockedUntil(userId: string, source: string): Promise<Date | null> {
      const [row] = await db.select().from(signInFailures).where(and(eq(signInFailures.userId, userId), eq(signInFailures.source, source)));
      return row?.lockedUntil ?? null;
    },

    /** A new password (reset or set) lifts every lock on the account. */
    async clear(userId: string, tx: Db = db): Promise<void> {
      await tx.delete(signInFailures).where(eq(signInFailures.userId, userId));
    },
  };
}

export type SignInGuard = ReturnType<typeof createSignInGuard>;
