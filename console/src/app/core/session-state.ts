import type { Membership, OrganizationRef, Role, Session, UserView } from './api-types.js';

/** What a tab knows about the signed-in user; everything but the refresh token. */
export interface SessionState {
  accessToken: string;
  accessTokenExpiresAt: string;
  user: UserView;
  organization: OrganizationRef | null;
  memberships: Membership[];
  /** The role in the organisation acted in; null when acting in none. */
  role: Role | null;
}

/** The operator acts as admin in any organisation (the API's switch-organization answer says so). */
export function roleIn(user: UserView, memberships: Membership[], organization: OrganizationRef | null): Role | null {
  if (!organization) return null;
  const membership = memberships.find((m) => m.organization.id === organization.id);
  if (membership) return membership.role;
  return user.operator ? 'admin' : null;
}

export function stateOf(session: Session): SessionState {
  const { accessToken, accessTokenExpiresAt, user, organization, memberships } = session;
  return { accessToken, accessTokenExpiresAt, user, organization, memberships, role: roleIn(user, memberships, organization) };
}
