import { createHmac, randomBytes, randomUUID } from 'node:crypto';
import { and, eq, gt, isNull } from 'drizzle-orm';
import { z } from 'zod';
import type { OrganizationRef, Session, SwitchedOrganization } from '../../shared/schemas/accounts.js';
import type { AccessTokens } from '../auth/access-tokens.js';
import { verifyPassword } from '../auth/passwords.js';
import type { Db } from '../db/client.js';
import { organizations, refreshTokens } from '../db/schema.js';
import type { SignInGuard } from './sign-in-guard.js';
import type { MembershipView } from '../../shared/schemas/accounts.js';
import { userView, type UserRow, type UserService } from './users.js';

export const REFRESH_TOKEN_TTL_MS = 30 * 24 * 3600 * 1000;

export type SignInResult =
  | { ok: true; session: Session; user: UserRow; userId: string }
  /** `locked`: the source is locked out; callers answer it exactly as a wrong password. */
  | { ok: false; reason: 'unknown_email' | 'bad_password' | 'locked'; userId: string | null };

export type RefreshResult =
  | { ok: true; session: Session; userId: string }
  | { ok: false; reason: 'unknown' | 'expired' | 'revoked'; userId: string | null }
  /** A token already exchanged came back: someone holds a copy, so the whole family is revoked. */
  | { ok: false; reason: 'reused'; userId: string };

export type SwitchResult = { ok: true; switched: SwitchedOrganization } | { ok: false; reason: 'not_found' | 'session_ended' };

interface SessionDeps {
  db: Db;
  pepper: Buffer;
  clock: () => Date;
  accessTokens: AccessTokens;
  users: UserService;
  guard: SignInGuard;
}

/** Sign-in, refresh-token rotation with reuse detection, and sign-out. */
export function createSessionService({ db, pepper, clock, accessTokens, users: userService, guard }: SessionDeps) {
  const digest = (token: string) => createHmac('sha256', pepper).update(`refresh-token.${token}`).digest('hex');

  /**
   * A new refresh token in `familyId` plus an access token, as the API returns them. The session
   * acts in `organizationId` when the user may act there; a user's only (or first) membership
   * otherwise; an operator acts platform-wide until they switch.
   */
  async function issue(user: UserRow, familyId: string, organizationId: string | null, tx: Db = db): Promise<Session> {
    const now = clock();
    const memberships = await userService.membershipsOf(user.id, tx);
    const organization = await actingOrganization(user, memberships, organizationId, tx);
    const refreshToken = randomBytes(32).toString('base64url');
    const refreshTokenExpiresAt = new Date(now.getTime() + REFRESH_TOKEN_TTL_MS);
    await tx.insert(refreshTokens).values({
      userId: user.id,
      familyId,
      organizationId: organization?.id ?? null,
      tokenHash: digest(refreshToken),
      expiresAt: refreshTokenExpiresAt,
      createdAt: now,
    });
    const access = await accessTokens.sign({ sub: user.id, email: user.email, sid: familyId, org: organization?.id ?? null });
    return {
      accessToken: access.token,
      accessTokenExpiresAt: access.expiresAt.toISOString(),
      refreshToken,
      refreshTokenExpiresAt: refreshTokenExpiresAt.toISOString(),
      user: userView(user),
      organization,
      memberships,
    };
  }

  async function actingOrganization(user: UserRow, memberships: MembershipView[], wanted: string | null, tx: Db): Promise<OrganizationRef | null> {
    if (wanted) {
      const member = memberships.find((m) => m.organization.id === wanted);
      if (member) return member.organization;
      if (user.operator) {
        const [org] = await tx.select({ id: organizations.id, slug: organizations.slug, name: organizations.name }).from(organizations).where(eq(organizations.id, wanted));
        if (org) return org;
      }
    }
    return user.operator ? null : (memberships[0]?.organization ?? null);
  }

  async function revokeFamily(familyId: string, tx: Db = db): Promise<void> {
    await tx.update(refreshTokens).set({ revokedAt: clock() }).where(and(eq(refreshTokens.familyId, familyId), isNull(refreshTokens.revokedAt)));
  }

  return {
    /** A session for a user already proven (invitation accepted): a new token family. */
    async startSession(user: UserRow, organizationId: string | null, tx: Db = db): Promise<{ session: Session; sessionId: string }> {
      const sessionId = randomUUID();
      return { session: await issue(user, sessionId, organizationId, tx), sessionId };
    },

    /**
     * Acts in another organisation: a new access token, and the session's refresh tokens remember
     * the choice so a refresh keeps it. The operator may switch to any organisation, others only
     * to their memberships (anything else is not found, so ids do not leak).
     */
    async switchOrganization(userId: string, sessionId: string, slugOrId: string): Promise<SwitchResult> {
      const user = await userService.get(userId);
      if (!user) return { ok: false, reason: 'session_ended' };
      const now = clock();
      const [live] = await db
        .select({ id: refreshTokens.id })
        .from(refreshTokens)
        .where(and(eq(refreshTokens.familyId, sessionId), eq(refreshTokens.userId, userId), isNull(refreshTokens.usedAt), isNull(refreshTokens.revokedAt), gt(refreshTokens.expiresAt, now)));
      if (!live) return { ok: false, reason: 'session_ended' };
      const memberships = await userService.membershipsOf(userId);
      const isId = z.uuid().safeParse(slugOrId).success; // as the other services tell ids from names
      const member = memberships.find((m) => (isId ? m.organization.id === slugOrId.toLowerCase() : m.organization.slug === slugOrId));
      let organization: OrganizationRef | undefined = member?.organization;
      if (!organization && user.operator) {
        [organization] = await db
          .select({ id: organizations.id, slug: organizations.slug, name: organizations.name })
          .from(organizations)
          .where(isId ? eq(organizations.id, slugOrId.toLowerCase()) : eq(organizations.slug, slugOrId));
      }
      if (!organization) return { ok: false, reason: 'not_found' };
      await db.update(refreshTokens).set({ organizationId: organization.id }).where(and(eq(refreshTokens.familyId, sessionId), eq(refreshTokens.userId, userId)));
      const access = await accessTokens.sign({ sub: user.id, email: user.email, sid: sessionId, org: organization.id });
      return {
        ok: true,
        switched: {
          accessToken: access.token,
          accessTokenExpiresAt: access.expiresAt.toISOString(),
          organization,
          role: member?.role ?? 'admin', // the operator acts as an admin anywhere
        },
      };
    },

    /** `source` is the client's address: a lockout applies to the account from that source only. */
    async signIn(email: string, password: string, source: string): Promise<SignInResult> {
      const user = await userService.findByEmail(email);
      if (!user) {
        await verifyPassword(null, password); // the same work as for a real account
        return { ok: false, reason: 'unknown_email', userId: null };
      }
      const checked = await guard.check(user, password, source);
      if (checked !== 'ok') return { ok: false, reason: checked === 'locked' ? 'locked' : 'bad_password', userId: user.id };
      return { ok: true, session: await issue(user, randomUUID(), null), user, userId: user.id };
    },

    /** Exchanges a refresh token for a new pair; the presented one is used up. */
    async refresh(token: string): Promise<RefreshResult> {
      const [row] = await db.select().from(refreshTokens).where(eq(refreshTokens.tokenHash, digest(token)));
      if (!row) return { ok: false, reason: 'unknown', userId: null };
      if (row.revokedAt) return { ok: false, reason: 'revoked', userId: row.userId };
      if (row.usedAt) {
        await revokeFamily(row.familyId);
        return { ok: false, reason: 'reused', userId: row.userId };
      }
      const now = clock();
      if (row.expiresAt <= now) return { ok: false, reason: 'expired', userId: row.userId };

      return db.transaction(async (tx) => {
        // Conditional, so two concurrent exchanges of one token cannot both win: the loser is a reuse.
        const [claimed] = await tx
          .update(refreshTokens)
          .set({ usedAt: now })
          .where(and(eq(refreshTokens.id, row.id), isNull(refreshTokens.usedAt), isNull(refreshTokens.revokedAt)))
          .returning();
        const user = claimed ? await userService.get(row.userId, tx) : undefined;
        if (!claimed || !user) {
          await revokeFamily(row.familyId, tx);
          return { ok: false as const, reason: 'reused' as const, userId: row.userId };
        }
        return { ok: true as const, session: await issue(user, row.familyId, row.organizationId, tx), userId: user.id };
      });
    },

    /** Revokes the token's whole family; the user id when the token was known. */
    async signOut(token: string): Promise<string | null> {
      const [row] = await db.select().from(refreshTokens).where(eq(refreshTokens.tokenHash, digest(token)));
      if (!row) return null;
      await revokeFamily(row.familyId);
      return row.userId;
    },

    /** Ends every session of a user (after a password reset). */
    async revokeAllFor(userId: string, tx: Db = db): Promise<void> {
      await tx.update(refreshTokens).set({ revokedAt: clock() }).where(and(eq(refreshTokens.userId, userId), isNull(refreshTokens.revokedAt)));
    },
  };
}

export type SessionService = ReturnType<typeof createSessionService>;
