/**
 * Who may do what, as plain data (no zod) so the API, its schemas and the console's key form read
 * one table: the scopes a key may hold, the ones an embed key may hold, and what each role may
 * grant (a new key's scopes never exceed its creator's).
 */
export const SCOPE_VALUES = [
  'sizing:run',
  'projects:read',
  'projects:write',
  'catalog:read',
  'catalog:write',
  'batches:write',
  'batches:read',
  'usage:read',
  'keys:manage',
] as const;
export type ScopeValue = (typeof SCOPE_VALUES)[number];

/** Embed (browser) keys only ever get sizing and reading active catalog items. */
export const EMBED_SCOPE_VALUES: readonly ScopeValue[] = ['sizing:run', 'catalog:read'];

/** Roles inside an organisation, most privileged first. */
export const ROLE_VALUES = ['admin', 'estimator', 'viewer'] as const;
export type RoleValue = (typeof ROLE_VALUES)[number];

/** The scopes a user of a role could grant to a key. */
export const ROLE_GRANTS: Record<RoleValue, readonly ScopeValue[]> = {
  admin: SCOPE_VALUES,
  estimator: ['sizing:run', 'projects:read', 'projects:write', 'catalog:read', 'batches:write', 'batches:read'],
  viewer: ['projects:read', 'catalog:read', 'usage:read', 'batches:read'],
};

/** Scopes that also grant another: a key that may run batch jobs may read them. */
const IMPLIED_BY: Partial<Record<ScopeValue, readonly ScopeValue[]>> = { 'batches:read': ['batches:write'] };

/** True when a key holding `held` may call a route that needs `needed`. */
export function scopeGranted(held: readonly string[], needed: ScopeValue): boolean {
  return held.includes(needed) || (IMPLIED_BY[needed] ?? []).some((s) => held.includes(s));
}
