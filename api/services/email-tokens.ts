import { createHmac, randomBytes } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import type { Role } from '../auth/scopes.js';
import type { Db } from '../db/client.js';
import { emailTokens } from '../db/schema.js';

export type EmailTokenPurpose = 'invitation' | 'password_reset';
export type EmailTokenRow = typeof emailTokens.$inferSelect;

export interface IssueEmailTokenInput {
  purpose: EmailTokenPurpose;
  email: string;
  ttlMs: number;
  userId?: string | null;
  organizationId?: string | null;
  role?: Role | null;
}

/**
 * Single-use, expiring tokens for links sent by e-mail. Only an HMAC of the token is stored, so
 * a copy of the database cannot be turned into working links.
 */
export function createEmailTokenService({ db, pepper, clock }: { db: Db; pepper: Buffer; clock: () => Date }) {
  // Bound to its use, so a hash of an e-mail token can never match a refresh token or a key.
  const digest = (token: string) => createHmac('sha256', pepper).update(`email-token.${token}`).digest('hex');
  const usable = (purpose: EmailTokenPurpose, token: string) =>
    and(eq(emailTokens.tokenHash, digest(token)), eq(emailTokens.purpose, purpose), isNull(emailTokens.usedAt), gt(emailTokens.expiresAt, clock()));

  return {
    /** A fresh token (32 random bytes) and its stored row; the token itself goes only into the e-mail. */
    async issue(input: IssueEmailTokenInput, tx: Db = db): Promise<{ token: string; row: EmailTokenRow }> {
      const token = randomBytes(32).toString('base64url');
      const now = clock();
      const [row] = await tx
        .insert(emailTokens)
        .values({
          purpose: input.purpose,
          tokenHash: digest(token),
          email: input.email,
          userId: input.userId ?? null,
          organizationId: input.organizationId ?? null,
          role: input.role ?? null,
          expiresAt: new Date(now.getTime() + input.ttlMs),
          createdAt: now,
        })
        .returning();
      return { token, row };
    },

    /** The row of a token that is still usable, without using it up. */
    async peek(purpose: EmailTokenPurpose, token: string, tx: Db = db): Promise<EmailTokenRow | undefined> {
      const [row] = await tx.select().from(emailTokens).where(usable(purpose, token));
      return row;
    },

    /**
     * Uses the token up and returns its row, or undefined when it is unknown, used or expired.
     * One conditional UPDATE, so two concurrent uses cannot both succeed.
     */
    async consume(purpose: EmailTokenPurpose, token: string, tx: Db = db): Promise<EmailTokenRow | undefined> {
      const [row] = await tx.update(emailTokens).set({ usedAt: clock() }).where(usable(purpose, token)).returning();
      return row;
    },

    /** Voids every other unused token of a user for a purpose (e.g. older reset links after a reset). */
    async voidFor(purpose: EmailTokenPurpose, userId: string, tx: Db = db): Promise<void> {
      await tx
        .update(emailTokens)
        .set({ usedAt: clock() })
        .where(and(eq(emailTokens.purpose, purpose), eq(emailTokens.userId, userId), isNull(emailTokens.usedAt)));
    },
  };
}

export type EmailTokenService = ReturnType<typeof createEmailTokenService>;
