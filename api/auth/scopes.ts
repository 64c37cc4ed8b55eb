import { SCOPE_VALUES } from '../../shared/schemas/api-keys.js';

/** What an API key may do. Embed (browser) keys only ever get `sizing:run` and `catalog:read`. */
export const SCOPES = SCOPE_VALUES;
export type Scope = (typeof SCOPES)[number];

export const EMBED_SCOPES: readonly Scope[] = ['sizing:run', 'catalog:read'];

/** Roles inside an organisation, most privileged first. */
export const ROLES = ['admin', 'estimator', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

const RANK: Record<Role, number> = { admin: 3, estimator: 2, viewer: 1 };

export function roleAtLeast(role: Role, needed: Role): boolean {
  return RANK[role] >= RANK[needed];
}

/**
 * The scopes a user of a role could grant to a key: a new key's scopes can never exceed those of
 * whoever creates it.
 */
export const ROLE_SCOPES: Record<Role, readonly Scope[]> = {
  admin: SCOPES,
  estimator: ['sizing:run', 'projects:read', 'projects:write', 'catalog:read', 'batches:write'],
  viewer: ['projects:read', 'catalog:read', 'usage:read'],
};
