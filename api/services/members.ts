import { and, asc, eq, gt } from 'drizzle-orm';
import { z } from 'zod';
import type { InvitationView, MemberView, Session } from '../../shared/schemas/accounts.js';
import { hashPassword } from '../auth/passwords.js';
import type { SignInGuard } from './sign-in-guard.js';
import type { Role } from '../auth/scopes.js';
import type { Db } from '../db/client.js';
import { memberships, organizations, users } from '../db/schema.js';
import { HttpProblem, problems } from '../problem.js';
import type { EmailTokenService } from './email-tokens.js';
import type { Mailer } from './mailer.js';
import { decodeCursor, toPage, type Page, type PageQuery } from './pagination.js';
import type { SessionService } from './sessions.js';
import { normalizeEmail, type UserRow, type UserService } from './users.js';

export const INVITATION_TTL_MS = 7 * 24 * 3600 * 1000;

interface MemberDeps {
  db: Db;
  clock: () => Date;
  publicUrl: string;
  users: UserService;
  emailTokens: EmailTokenService;
  sessions: SessionService;
  mailer: Mailer;
  guard: SignInGuard;
}

export interface AcceptedInvitation {
  session: Session;
  /** The new session's id (its refresh-token family). */
  sessionId: string;
  user: UserRow;
  organizationId: string;
  membershipId: string;
  role: Role;
  newAccount: boolean;
}

const memberColumns = {
  id: memberships.id,
  userId: memberships.userId,
  email: users.email,
  name: users.name,
  role: memberships.role,
  createdAt: memberships.createdAt,
};
type MemberRow = { id: string; userId: string; email: string; name: string | null; role: Role; createdAt: Date };

const memberView = (r: MemberRow): MemberView => ({ ...r, createdAt: r.createdAt.toISOString() });

export interface AddMemberInput {
  organizationId: string;
  userId: string;
  role: Role;
}

/**
 * Adds an existing user to an organisation; already a member is a 409 `already_member`.
 * Standalone too, so the seed can call it inside its own transaction.
 */
export async function addMember(db: Db, input: AddMemberInput, clock: () => Date = () => new Date()): Promise<MemberView> {
  const [row] = await db
    .insert(memberships)
    .values({ organizationId: input.organizationId, userId: input.userId, role: input.role, createdAt: clock() })
    .onConflictDoNothing()
    .returning({ id: memberships.id });
  if (!row) throw problems.conflict('already_member', 'The user is already a member of this organisation.');
  const [member] = await db
    .select(memberColumns)
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(eq(memberships.id, row.id));
  return memberView(member);
}

export const invalidToken = () => new HttpProblem(400, 'invalid_token', 'Invalid token', 'The link is unknown, already used or expired.');

/** Who belongs to an organisation, in which role, and how people are invited in. */
export function createMemberService({ db, clock, publicUrl, users: userService, emailTokens, sessions, mailer, guard }: MemberDeps) {
  /** Scoped to the organisation: another organisation's member is simply not found (404). */
  async function find(organizationId: string, id: string, tx: Db = db, lock = false): Promise<MemberRow> {
    if (!z.uuid().safeParse(id).success) throw problems.notFound('No such member.');
    const query = tx
      .select(memberColumns)
      .from(memberships)
      .innerJoin(users, eq(users.id, memberships.userId))
      .where(and(eq(memberships.id, id), eq(memberships.organizationId, organizationId)));
    const [row] = lock ? await query.for('update', { of: memberships }) : await query;
    if (!row) throw problems.notFound('No such member.');
    return row;
  }

  /** Locks the organisation's admin rows, so two admins cannot demote each other at once. */
  async function lockedAdminCount(organizationId: string, tx: Db): Promise<number> {
    const admins = await tx
      .select({ id: memberships.id })
      .from(memberships)
      .where(and(eq(memberships.organizationId, organizationId), eq(memberships.role, 'admin')))
      .orderBy(asc(memberships.id)) // one lock order for everyone: no deadlocks
      .for('update');
    return admins.length;
  }

  const lastAdmin = () => problems.conflict('last_admin', 'An organisation needs at least one admin: make someone else admin first.');

  return {
    view: memberView,

    /** Members ordered by e-mail (unique, so the cursor is simply the last e-mail served). */
    async list(organizationId: string, page: PageQuery): Promise<Page<MemberView>> {
      const after = decodeCursor(page.cursor, z.string());
      const rows = await db
        .select(memberColumns)
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.organizationId, organizationId), after ? gt(users.email, after) : undefined))
        .orderBy(asc(users.email))
        .limit(page.limit + 1);
      return toPage(rows, page.limit, memberView, (r) => r.email);
    },

    /** Adds an existing user to an organisation; already a member is a 409 `already_member`. */
    addMember(input: AddMemberInput, tx: Db = db): Promise<MemberView> {
      return addMember(tx, input, clock);
    },

    async changeRole(organizationId: string, id: string, role: Role): Promise<{ member: MemberView; from: Role }> {
      return db.transaction(async (tx) => {
        const admins = await lockedAdminCount(organizationId, tx);
        const current = await find(organizationId, id, tx, true);
        if (current.role === role) return { member: memberView(current), from: current.role };
        if (current.role === 'admin' && admins <= 1) throw lastAdmin();
        await tx.update(memberships).set({ role }).where(eq(memberships.id, current.id));
        return { member: memberView({ ...current, role }), from: current.role };
      });
    },

    async remove(organizationId: string, id: string): Promise<MemberView> {
      return db.transaction(async (tx) => {
        const admins = await lockedAdminCount(organizationId, tx);
        const current = await find(organizationId, id, tx, true);
        if (current.role === 'admin' && admins <= 1) throw lastAdmin();
        await tx.delete(memberships).where(eq(memberships.id, current.id));
        return memberView(current);
      });
    },

    /** Issues a 7-day single-use invitation and e-mails its link. */
    async invite(input: { organizationId: string; email: string; role: Role }): Promise<InvitationView> {
      const email = normalizeEmail(input.email);
      const [org] = await db.select({ name: organizations.name }).from(organizations).where(eq(organizations.id, input.organizationId));
      if (!org) throw problems.notFound('No such organisation.');
      const existing = await userService.findByEmail(email);
      if (existing) {
        const [member] = await db
          .select({ id: memberships.id })
          .from(memberships)
          .where(and(eq(memberships.organizationId, input.organizationId), eq(memberships.userId, existing.id)));
        if (member) throw problems.conflict('already_member', `${email} is already a member of this organisation.`);
      }
      const { token, row } = await emailTokens.issue({
        purpose: 'invitation',
        email,
        userId: existing?.id ?? null,
        organizationId: input.organizationId,
        role: input.role,
        ttlMs: INVITATION_TTL_MS,
      });
      const link = `${publicUrl}/accept-invitation?token=${encodeURIComponent(token)}`;
      await mailer.send({
        to: email,
        subject: `You are invited to ${org.name} on Treadwise`,
        text:
          `You have been invited to join ${org.name} on Treadwise as ${input.role}.\n\n` +
          `Accept the invitation here (the link works once, until ${row.expiresAt.toISOString()}):\n${link}\n\n` +
          'If you did not expect this, ignore this message.',
      });
      return { id: row.id, email, role: input.role, expiresAt: row.expiresAt.toISOString() };
    },

    /**
     * Uses an invitation: creates the account (name and password needed) or, for an existing
     * account, adds the membership once its own password is confirmed. Either way the result is
     * a signed-in session.
     */
    /** `source` is the client's address: a wrong password here counts towards that source's lockout. */
    async acceptInvitation(input: { token: string; name?: string; password?: string }, source: string): Promise<AcceptedInvitation> {
      const invitation = await emailTokens.peek('invitation', input.token);
      if (!invitation?.organizationId || !invitation.role) throw invalidToken();
      const existing = await userService.findByEmail(invitation.email);
      const needsPassword = !existing?.passwordHash;
      if (needsPassword) {
        const missing = [
          ...(input.password ? [] : [{ path: 'password', message: 'needed to create the account' }]),
          ...(existing || input.name ? [] : [{ path: 'name', message: 'needed to create the account' }]),
        ];
        if (missing.length) throw problems.validation(missing, 'This invitation creates a new account: give a name and a password.');
      } else {
        // The link alone must not sign anyone in to an account that already has a password:
        // a forwarded invitation would otherwise hand over that whole account.
        if (!input.password) {
          throw problems.validation([{ path: 'password', message: 'the password of your existing account' }], 'You already have an account: confirm with its password.');
        }
        // The same guard as sign-in: guesses here count towards the lockout, and a locked source
        // gets the same answer as a wrong password.
        if ((await guard.check(existing, input.password, source)) !== 'ok') {
          throw new HttpProblem(401, 'invalid_credentials', 'Unauthenticated', 'The password of the existing account is wrong.');
        }
      }
      const passwordHash = needsPassword && input.password ? await hashPassword(input.password) : null;
      const organizationId = invitation.organizationId;
      const role = invitation.role;

      return db.transaction(async (tx) => {
        // The conditional consume is what makes the link single-use, even for two racing requests.
        if (!(await emailTokens.consume('invitation', input.token, tx))) throw invalidToken();
        let user = existing;
        if (!user) {
          [user] = await tx
            .insert(users)
            .values({ email: invitation.email, name: input.name ?? null, passwordHash, createdAt: clock() })
            .onConflictDoNothing({ target: users.email })
            .returning();
          user ??= await userService.findByEmail(invitation.email, tx);
        } else if (passwordHash && needsPassword) {
          [user] = await tx
            .update(users)
            .set({ passwordHash, name: user.name ?? input.name ?? null })
            .where(eq(users.id, user.id))
            .returning();
        }
        if (!user) throw invalidToken();
        const [added] = await tx
          .insert(memberships)
          .values({ organizationId, userId: user.id, role, createdAt: clock() })
          .onConflictDoNothing()
          .returning({ id: memberships.id, role: memberships.role });
        // Already a member (joined another way meanwhile): keep the role they have.
        const membership =
          added ??
          (await tx
            .select({ id: memberships.id, role: memberships.role })
            .from(memberships)
            .where(and(eq(memberships.organizationId, organizationId), eq(memberships.userId, user.id))))[0];
        const started = await sessions.startSession(user, organizationId, tx);
        return {
          session: started.session,
          sessionId: started.sessionId,
          user,
          organizationId,
          membershipId: membership.id,
          role: membership.role,
          newAccount: !existing,
        };
      });
    },
  };
}

export type MemberService = ReturnType<typeof createMemberService>;
