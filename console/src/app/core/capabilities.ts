import type { Role } from './api-types.js';

/** What the console offers a role. The API decides (api/auth/policy.ts); this only hides what it would refuse. */
export type Capability =
  | 'keys:manage'
  | 'sizing:run'
  | 'usage:read'
  | 'members:manage'
  | 'audit:read'
  | 'catalog:read'
  | 'catalog:manage'
  | 'projects:read'
  | 'projects:write'
  | 'batches:read'
  | 'batches:write'
  | 'billing:read'
  | 'billing:manage';

const LEAST_ROLE: Record<Capability, Role> = {
  'keys:manage': 'admin',
  'sizing:run': 'estimator',
  'usage:read': 'viewer',
  'members:manage': 'admin',
  'audit:read': 'admin',
  'catalog:read': 'viewer',
  'catalog:manage': 'admin',
  'projects:read': 'viewer',
  'projects:write': 'estimator',
  'batches:read': 'viewer',
  'batches:write': 'estimator',
  'billing:read': 'viewer',
  'billing:manage': 'admin',
};

const RANK: Record<Role, number> = { admin: 3, estimator: 2, viewer: 1 };

export function roleMay(role: Role | null, capability: Capability): boolean {
  return role !== null && RANK[role] >= RANK[LEAST_ROLE[capability]];
}
