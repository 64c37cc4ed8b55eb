import type { Role } from '../core/api-types.js';
import { type Capability, roleMay } from '../core/capabilities.js';

/** One entry of the console's side navigation. */
export interface Destination {
  path: string;
  label: string;
  /** A name registered by provideConsoleIcons, e.g. `tw:status`. */
  icon: string;
  /** Shown only to roles that may do this; absent: every signed-in user. */
  needs?: Capability;
  /** Shown only to the platform operator, whatever the role. */
  operatorOnly?: true;
}

export const DESTINATIONS: readonly Destination[] = [
  { path: '/keys', label: 'Keys', icon: 'tw:key', needs: 'keys:manage' },
  { path: '/projects', label: 'Projects', icon: 'tw:stair', needs: 'projects:read' },
  { path: '/catalog', label: 'Catalog', icon: 'tw:catalog', needs: 'catalog:read' },
  { path: '/batches', label: 'Batches', icon: 'tw:batch', needs: 'batches:read' },
  { path: '/traffic', label: 'Traffic', icon: 'tw:traffic', needs: 'usage:read' },
  { path: '/bench', label: 'Bench', icon: 'tw:bench', needs: 'sizing:run' },
  { path: '/team', label: 'Team', icon: 'tw:team', needs: 'members:manage' },
  { path: '/activity', label: 'Activity', icon: 'tw:activity', needs: 'audit:read' },
  { path: '/billing', label: 'Billing', icon: 'tw:billing', needs: 'billing:read' },
  { path: '/operator/organizations', label: 'Organisations', icon: 'tw:organizations', operatorOnly: true },
  { path: '/operator/outbox', label: 'Mail outbox', icon: 'tw:mail', operatorOnly: true },
  { path: '/status', label: 'Status', icon: 'tw:status' },
];

export function destinationsFor(role: Role | null, operator = false): Destination[] {
  return DESTINATIONS.filter((d) => (d.operatorOnly ? operator : !d.needs || roleMay(role, d.needs)));
}
