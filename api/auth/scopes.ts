import { EMBED_SCOPE_VALUES, ROLE_GRANTS, ROLE_VALUES, SCOPE_VALUES } from '../../shared/tables/access.js';

/** What an API key may do. Embed (browser) keys only ever get `sizing:run` and `catalog:read`. */
export const SCOPES = SCOPE_VALUES;
export type Scope = (typeof SCOPES)[number];

export const EMBED_SCOPES: readonly Scope[] = EMBED_SCOPE_VALUES;

/** Roles inside an organisation, most privileged first. */
export const ROLES = ROLE_VALUES;
export type Role = (typeof ROLES)[number];

const RANK: Record<Role, number> = { admin: 3, estimator: 2, viewer: 1 };

export function roleAtLeast(role: Role, needed: Role): boolean {
  return RANK[role] >= RANK[needed];
}

/**
 * The scopes a user of a role could grant to a key: a new key's scopes can never exceed those of
 * whoever creates it.
 */
export const ROLE_SCOPES: Record<Role, readonly Scope[]> = ROLE_GRANTS;
