import type { AuditEvent, Member, Role } from '../core/api-types.js';

/** An invitation that may still be accepted, as far as the console can tell. */
export interface PendingInvitation {
  id: string;
  email: string;
  role: Role;
  expiresAt: string;
  sentAt: string;
}

const ROLES: readonly string[] = ['admin', 'estimator', 'viewer'];

function text(data: AuditEvent['data'], key: string): string | null {
  const value = data?.[key];
  return typeof value === 'string' ? value : null;
}

/**
 * Invitations sent and not yet used: the newest `member.invited` event per address, unless it has
 * expired, the address has joined since, or it belongs to a member now. Events come newest first.
 */
export function pendingInvitations(invited: AuditEvent[], joined: AuditEvent[], members: Member[], now: Date): PendingInvitation[] {
  const memberEmails = new Set(members.map((m) => m.email.toLowerCase()));
  const lastJoined = new Map<string, string>();
  for (const event of joined) {
    const email = text(event.data, 'email')?.toLowerCase();
    if (email && !lastJoined.has(email)) lastJoined.set(email, event.createdAt);
  }
  const seen = new Set<string>();
  const pending: PendingInvitation[] = [];
  for (const event of invited) {
    const email = text(event.data, 'email')?.toLowerCase();
    const role = text(event.data, 'role');
    const expiresAt = text(event.data, 'expiresAt');
    if (!email || !role || !ROLES.includes(role) || !expiresAt || seen.has(email)) continue;
    seen.add(email);
    const joinedAt = lastJoined.get(email);
    if (memberEmails.has(email) || (joinedAt && joinedAt >= event.createdAt)) continue;
    if (Date.parse(expiresAt) <= now.getTime()) continue;
    pending.push({ id: event.target.id ?? event.id, email, role: role as Role, expiresAt, sentAt: event.createdAt });
  }
  return pending;
}
