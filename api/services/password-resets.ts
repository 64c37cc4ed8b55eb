import { eq } from 'drizzle-orm';
import { hashPassword } from '../auth/passwords.js';
import type { Db } from '../db/client.js';
import { signInFailures, users } from '../db/schema.js';
import type { EmailTokenService } from './email-tokens.js';
import type { Mailer } from './mailer.js';
import type { SessionService } from './sessions.js';
import type { UserService } from './users.js';

export const PASSWORD_RESET_TTL_MS = 3600 * 1000;

interface PasswordResetDeps {
  db: Db;
  publicUrl: string;
  users: UserService;
  emailTokens: EmailTokenService;
  sessions: SessionService;
  mailer: Mailer;
}

/** Password reset by a single-use link, valid for one hour. */
export function createPasswordResetService({ db, publicUrl, users: userService, emailTokens, sessions, mailer }: PasswordResetDeps) {
  const pending = new Set<Promise<unknown>>();
  return {
    /**
     * Starts `request(email)` without waiting for it, so the answer (202) takes the same time
     * whether or not the address has an account. `done` gets the user id when one was mailed.
     */
    requestInBackground(email: string, done: (userId: string) => Promise<void>, onError: (err: unknown) => void): void {
      const work = this.request(email)
        .then((userId) => (userId ? done(userId) : undefined))
        .catch(onError)
        .finally(() => pending.delete(work));
      pending.add(work);
    },

    /** Resolves when every reset started in the background has been handled (shutdown, tests). */
    async settled(): Promise<void> {
      while (pending.size) await Promise.all([...pending]);
    },

    /** E-mails a reset link when the account exists; the caller answers the same either way. Returns the user id, if any. */
    async request(email: string): Promise<string | null> {
      const user = await userService.findByEmail(email);
      if (!user) return null;
      const { token } = await emailTokens.issue({ purpose: 'password_reset', email: user.email, userId: user.id, ttlMs: PASSWORD_RESET_TTL_MS });
      const link = `${publicUrl}/reset-password?token=${encodeURIComponent(token)}`;
      await mailer.send({
        to: user.email,
        subject: 'Reset your Treadwise password',
        text:
          `Someone asked to reset the password of your Treadwise account (${user.email}).\n\n` +
          `Choose a new password here (the link works once, for one hour):\n${link}\n\n` +
          'If it was not you, ignore this message; your password stays as it is.',
      });
      return user.id;
    },

    /**
     * Sets the new password, uses the token up, voids other reset links and ends every session.
     * Returns the user id, or null when the token is unknown, used or expired.
     */
    async confirm(token: string, password: string): Promise<string | null> {
      // A cheap look first, so bogus tokens cost no argon2 work; hashing stays outside the
      // transaction because it is deliberately slow.
      if (!(await emailTokens.peek('password_reset', token))) return null;
      const passwordHash = await hashPassword(password);
      return db.transaction(async (tx) => {
        const row = await emailTokens.consume('password_reset', token, tx);
        if (!row?.userId) return null;
        await tx.update(users).set({ passwordHash }).where(eq(users.id, row.userId));
        await tx.delete(signInFailures).where(eq(signInFailures.userId, row.userId)); // lifts every lockout
        await emailTokens.voidFor('password_reset', row.userId, tx);
        await sessions.revokeAllFor(row.userId, tx);
        return row.userId;
      });
    },
  };
}

export type PasswordResetService = ReturnType<typeof createPasswordResetService>;
